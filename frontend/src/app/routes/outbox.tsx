import { Alert, Card, Skeleton } from 'antd';
import { QueryError } from '@/components/query-error';
import { useOutbox } from '@/features/account/api/get-outbox';
import { OutboxList } from '@/features/account/components/outbox-list';
import '@/features/account/components/account.css';
import { LabAdminPage } from '@/features/admin/components/lab-admin-page';
import { ApiRequestError } from '@/lib/api-client';
import { isAdmin } from '@/lib/roles';

function OutboxPanel() {
  const outbox = useOutbox(true);
  if (outbox.isPending) return <Skeleton active paragraph={{ rows: 6 }} />;
  if (outbox.isError) {
    if (outbox.error instanceof ApiRequestError && outbox.error.status === 404) {
      return (
        <Alert
          type="info"
          showIcon
          title="Kiln sends real mail here, so there is no local outbox."
          description="The outbox exists only when Kiln runs with its local SMTP sink (KILN_MAIL_SINK=1). Messages went to your mail server; look there, or in the recipients' inboxes."
        />
      );
    }
    return <QueryError what="the outbox" error={outbox.error} onRetry={() => void outbox.refetch()} />;
  }
  return (
    <Card className="panel" size="small" title="Messages" extra={<span className="panel__meta">{outbox.data.length} kept, newest first</span>}>
      <OutboxList messages={outbox.data} />
    </Card>
  );
}

function OutboxRoute() {
  return (
    <LabAdminPage
      section="Outbox"
      subtitle="Local mode: every e-mail Kiln sent went to the built-in mail sink instead of real inboxes. Read them here as their recipients would."
      deniedExplanation="The outbox shows everyone's invitations and password-reset links."
    >
      {(me) => (isAdmin(me.role) ? <OutboxPanel /> : null)}
    </LabAdminPage>
  );
}

export { OutboxRoute as Component };
