import { LabAdminPage } from '@/features/admin/components/lab-admin-page';
import { AuditLogPanel } from '@/features/admin/components/audit-log-panel';

function LabAuditRoute() {
  return (
    <LabAdminPage
      section="Audit log"
      subtitle="Every change to quotas, roles and access: who made it, when, and what it was before."
      deniedExplanation="The audit log lists changes to everyone's quotas and accounts."
    >
      {() => <AuditLogPanel />}
    </LabAdminPage>
  );
}

export { LabAuditRoute as Component };
