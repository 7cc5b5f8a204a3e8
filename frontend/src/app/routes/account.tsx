import { Role } from '@kiln/shared';
import { Card } from 'antd';
import { PageHeader } from '@/components/page-header';
import { notificationSettingsQueryOptions } from '@/features/account/api/notification-settings';
import { apiTokensQueryOptions } from '@/features/account/api/api-tokens';
import { ApiTokensPanel } from '@/features/account/components/api-tokens-panel';
import { NotificationSwitches } from '@/features/account/components/notification-switches';
import '@/features/account/components/account.css';
import { useMe } from '@/features/auth/api/get-me';
import { useStudies } from '@/features/studies/api/get-studies';
import { uploadsQueryOptions } from '@/features/uploads/api/get-uploads';
import { UploadsPanel } from '@/features/uploads/components/uploads-panel';
import { roleAbilities } from '@/lib/roles';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader() {
  if (getToken()) {
    void queryClient.prefetchQuery(notificationSettingsQueryOptions());
    void queryClient.prefetchQuery(apiTokensQueryOptions());
    void queryClient.prefetchQuery(uploadsQueryOptions());
  }
  return null;
}

function AccountRoute() {
  const me = useMe();
  const studies = useStudies();
  // A checkpoint can be resumed only where the person may start runs.
  const workStudies = (studies.data ?? []).filter((s) => s.myRole === 'owner' || s.myRole === 'member' || me.data?.role === Role.Admin);
  return (
    <div className="page page--wide">
      <title>Your account · Kiln</title>
      <PageHeader title="Your account" subtitle={me.data ? `${me.data.name} · ${me.data.email}` : undefined} />
      <div className="page__grid">
        <div className="page__main">
          <ApiTokensPanel />
          <UploadsPanel workStudies={workStudies.map((s) => ({ id: s.id, name: s.name }))} />
        </div>
        <div className="page__side">
          <NotificationSwitches />
          <Card title="What you can do" className="panel" size="small">
            <p style={{ marginTop: 0 }}>{me.data ? roleAbilities[me.data.role] : '…'}</p>
            <p className="panel__note">
              Every route of Kiln&apos;s API is described in the{' '}
              <a href="/api/docs" target="_blank" rel="noreferrer">
                API reference
              </a>
              ; a token acts with your role and access, never more.
            </p>
          </Card>
        </div>
      </div>
    </div>
  );
}

export { AccountRoute as Component };
