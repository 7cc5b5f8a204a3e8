import { Skeleton } from 'antd';
import './lab-admin.css';
import type { ReactNode } from 'react';
import { AccessDenied } from '@/components/access-denied';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { useMe } from '@/features/auth/api/get-me';
import { isAdmin } from '@/lib/roles';
import type { User } from '@kiln/shared';
import { LabSections } from './lab-sections';

/**
 * The frame of every lab admin page: checks the role first (the API answers 403
 * anyway; this says so in words), then the title, the section links and the page.
 */
export function LabAdminPage({
  section,
  subtitle,
  deniedExplanation,
  extra,
  children,
}: {
  section: string;
  subtitle: ReactNode;
  /** What the page is for, told to someone who may not see it. */
  deniedExplanation: string;
  extra?: ReactNode;
  children: (me: User) => ReactNode;
}) {
  const me = useMe();
  const title = <title>{`${section} · Lab · Kiln`}</title>;
  if (me.isPending) return <Skeleton active paragraph={{ rows: 6 }} />;
  if (me.isError) return <QueryError what="your account" error={me.error} onRetry={() => void me.refetch()} />;
  if (!isAdmin(me.data.role)) {
    return (
      <>
        {title}
        <AccessDenied
          title="Only lab admins can see this page"
          explanation={`${deniedExplanation} These pages are for lab admins. Your own slots and this month's CPU-hours are on the Overview; if you need a change, or think your role is wrong, ask a lab admin.`}
        />
      </>
    );
  }
  return (
    <div className="page page--wide">
      {title}
      <PageHeader title={`Lab · ${section}`} subtitle={subtitle} extra={extra} />
      <LabSections />
      <div className="page__stack">{children(me.data)}</div>
    </div>
  );
}
