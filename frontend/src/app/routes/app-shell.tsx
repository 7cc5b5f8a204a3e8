import type { User } from '@kiln/shared';
import { Button, Layout, Menu, type MenuProps } from 'antd';
import { Link, Navigate, Outlet, useLocation, useNavigation } from 'react-router-dom';
import { QueryError } from '@/components/query-error';
import { IconFlare, IconLab, IconOverview, IconSignOut, IconStudies } from '@/components/icons';
import { FullPageSpinner } from '@/components/full-page-spinner';
import { KilnMark, KilnWordmark } from '@/components/kiln-mark';
import { RoleTag } from '@/components/role-tag';
import { palette } from '@/config/palette';
import { paths } from '@/config/paths';
import { useMe } from '@/features/auth/api/get-me';
import { useSignOut, useToken } from '@/features/auth/hooks/use-session';
import { isAdmin } from '@/lib/roles';

function navItems(user: User): MenuProps['items'] {
  const items: MenuProps['items'] = [
    { key: paths.overview.path, icon: <IconOverview />, label: <Link to={paths.overview.getHref()}>Overview</Link> },
    { key: paths.studies.path, icon: <IconStudies />, label: <Link to={paths.studies.getHref()}>Studies</Link> },
    { key: paths.candidates.path, icon: <IconFlare />, label: <Link to={paths.candidates.getHref()}>Candidates</Link> },
  ];
  if (isAdmin(user.role)) {
    items.push({ key: paths.lab.path, icon: <IconLab />, label: <Link to={paths.lab.getHref()}>Lab</Link> });
  }
  return items;
}

function selectedKey(pathname: string): string {
  if (pathname === paths.lab.path || pathname.startsWith(`${paths.lab.path}/`)) return paths.lab.path;
  if (pathname === paths.candidates.path || pathname.startsWith(`${paths.candidates.path}/`)) return paths.candidates.path;
  // Studies, sweeps and runs all live under "Studies".
  if (/^\/(studies|sweeps|runs)(\/|$)/.test(pathname)) return paths.studies.path;
  return pathname === paths.overview.path ? paths.overview.path : '';
}

function Shell({ user }: { user: User }) {
  const location = useLocation();
  const navigation = useNavigation();
  const signOut = useSignOut();

  return (
    <Layout className="shell">
      <Layout.Sider width={216} breakpoint="lg" collapsedWidth={60} className="shell__sider" theme="dark">
        <Link to={paths.overview.getHref()} className="shell__brand" aria-label="Kiln, go to Overview">
          <span className="shell__brand-full">
            <KilnWordmark inverted size={26} />
          </span>
          <span className="shell__brand-mark">
            <KilnMark size={26} sphereColor="#f4f1ec" gapColor={palette.soot} />
          </span>
        </Link>
        <nav aria-label="Main">
          <Menu theme="dark" mode="inline" selectedKeys={[selectedKey(location.pathname)]} items={navItems(user)} />
        </nav>
      </Layout.Sider>
      <Layout>
        <Layout.Header className="shell__header">
          <div className="shell__progress" data-active={navigation.state !== 'idle'} aria-hidden="true" />
          <div className="shell__header-spacer" />
          <div className="shell__user" aria-label="Signed in as">
            <Link to={paths.account.getHref()} className="shell__user-name" title="Your account: notifications, API tokens, uploads">
              {user.name}
            </Link>
            <RoleTag role={user.role} />
          </div>
          <Button icon={<IconSignOut />} onClick={signOut}>
            Sign out
          </Button>
        </Layout.Header>
        <Layout.Content className="shell__content">
          <Outlet />
        </Layout.Content>
      </Layout>
    </Layout>
  );
}

function SignedInArea() {
  const me = useMe();
  const signOut = useSignOut();
  if (me.isPending) return <FullPageSpinner label="Checking your session…" />;
  if (me.isError) {
    return (
      <div className="full-page-center">
        <div className="full-page-center__box">
          <QueryError what="your account" error={me.error} onRetry={() => void me.refetch()} />
          <Button type="link" onClick={signOut}>
            Sign out
          </Button>
        </div>
      </div>
    );
  }
  return <Shell user={me.data} />;
}

/** Signed-in area: without a token, go to the sign-in page and come back here afterwards. */
function AppShellRoute() {
  const token = useToken();
  const location = useLocation();
  if (!token) return <Navigate to={paths.signIn.getHref(location.pathname + location.search)} replace />;
  return <SignedInArea />;
}

export { AppShellRoute as Component };
