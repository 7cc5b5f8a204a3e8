import { createInvitationSchema, type Invitation } from '@kiln/shared';
import { Alert, App, Button, Card, Form, Input, Popconfirm, Select, Skeleton, type FormRule } from 'antd';
import { IconCheck, IconClock, IconCross, IconIdle, IconRefresh } from '@/components/icons';
import { QueryError } from '@/components/query-error';
import { StatusTag } from '@/components/status-tag';
import { describeError } from '@/lib/describe-error';
import { formatDateTime } from '@/lib/format';
import { useStudyInvitations } from '../api/get-study-invitations';
import { useCreateInvitation, useResendInvitation, useRevokeInvitation } from '../api/manage-invitations';
import './invitations.css';

interface Values {
  email: string;
  role: 'member' | 'viewer';
}

const emailRule: FormRule = () => ({
  validator: async (_rule, value: unknown) => {
    const result = createInvitationSchema.shape.email.safeParse(value ?? '');
    if (!result.success) throw new Error(result.error.issues[0]?.message ?? 'invalid');
  },
});

function InvitationStatus({ invitation }: { invitation: Invitation }) {
  switch (invitation.status) {
    case 'pending':
      return <StatusTag tone="info" label="Waiting" icon={<IconClock />} title={`The link works until ${formatDateTime(invitation.expiresAt)}`} />;
    case 'accepted':
      return <StatusTag tone="ok" label="Accepted" icon={<IconCheck />} />;
    case 'revoked':
      return <StatusTag tone="idle" label="Revoked" icon={<IconCross />} />;
    case 'expired':
      return <StatusTag tone="warn" label="Expired" icon={<IconIdle />} title="Resend to mail a fresh link" />;
  }
}

function InvitationRow({ studyId, invitation }: { studyId: string; invitation: Invitation }) {
  const resend = useResendInvitation(studyId);
  const revoke = useRevokeInvitation(studyId);
  const { message } = App.useApp();
  const open = invitation.status === 'pending' || invitation.status === 'expired';
  const failure = resend.error ?? revoke.error;
  return (
    <li className="invitation-list__item" data-email={invitation.email}>
      <div className="invitation-list__head">
        <span className="invitation-list__email">{invitation.email}</span>
        <InvitationStatus invitation={invitation} />
      </div>
      <div className="member-list__meta">
        {invitation.role === 'viewer' ? 'Viewer (can only look)' : 'Member'} · sent {formatDateTime(invitation.createdAt)}
        {invitation.status === 'pending' ? ` · link works until ${formatDateTime(invitation.expiresAt)}` : ''}
      </div>
      {open ? (
        <div className="invitation-list__actions">
          <Button
            size="small"
            icon={<IconRefresh />}
            loading={resend.isPending}
            aria-label={`Resend the invitation to ${invitation.email}`}
            onClick={() => resend.mutate(invitation.id, { onSuccess: () => void message.success(`A fresh link went to ${invitation.email}; the old one no longer works.`) })}
          >
            Resend
          </Button>
          {invitation.status === 'pending' ? (
            <Popconfirm
              title={`Revoke the invitation to ${invitation.email}?`}
              description="The link in their e-mail stops working at once."
              okText="Revoke"
              okButtonProps={{ danger: true }}
              onConfirm={() => revoke.mutateAsync(invitation.id).then(() => void message.success(`Invitation to ${invitation.email} revoked.`))}
            >
              <Button size="small" danger loading={revoke.isPending} aria-label={`Revoke the invitation to ${invitation.email}`}>
                Revoke
              </Button>
            </Popconfirm>
          ) : null}
        </div>
      ) : null}
      {failure ? <Alert type="error" showIcon role="alert" title={describeError(failure).problem} description={describeError(failure).remedy} /> : null}
    </li>
  );
}

/** The study's invitations: invite by e-mail and role; resend or revoke what is still open. */
export function InvitePanel({ studyId, studyName }: { studyId: string; studyName: string }) {
  const [form] = Form.useForm<Values>();
  const invitations = useStudyInvitations(studyId);
  const create = useCreateInvitation(studyId);
  const { message } = App.useApp();

  const submit = async (values: Values) => {
    const body = createInvitationSchema.safeParse(values);
    if (!body.success) return;
    try {
      await create.mutateAsync(body.data);
      form.resetFields(['email']);
      void message.success(`Invitation mailed to ${body.data.email}.`);
    } catch {
      // Shown under the form.
    }
  };
  const failure = create.error ? describeError(create.error) : null;

  return (
    <Card title="Invite people" className="panel" size="small" extra={<span className="panel__meta">by e-mail, into this study only</span>}>
      <Form<Values>
        form={form}
        layout="vertical"
        requiredMark={false}
        validateTrigger="onBlur"
        initialValues={{ role: 'member' }}
        onFinish={submit}
        onValuesChange={() => create.error && create.reset()}
        className="invite-form"
      >
        <Form.Item label="E-mail" name="email" rules={[emailRule]} validateFirst>
          <Input inputMode="email" spellCheck={false} autoCapitalize="off" placeholder="name@institute.example" />
        </Form.Item>
        <Form.Item label="Role in this study" name="role">
          <Select
            aria-label="Role in this study"
            options={[
              { value: 'member', label: 'Member (forks, resumes, verdicts)' },
              { value: 'viewer', label: 'Viewer (can only look)' },
            ]}
          />
        </Form.Item>
        {failure ? <Alert type="error" showIcon role="alert" className="invite-form__failure" title="No invitation was sent." description={`${failure.problem} ${failure.remedy}`} /> : null}
        <Button type="primary" htmlType="submit" loading={create.isPending}>
          Send invitation
        </Button>
      </Form>
      <p className="panel__note">
        They get a one-time link to “{studyName}” that expires; someone new chooses a name and password, someone with an account signs in.
      </p>
      {invitations.isPending ? (
        <Skeleton active paragraph={{ rows: 2 }} />
      ) : invitations.isError ? (
        <QueryError what="the invitations" error={invitations.error} onRetry={() => void invitations.refetch()} />
      ) : invitations.data.length === 0 ? (
        <p className="muted">No invitations yet.</p>
      ) : (
        <ul className="invitation-list" aria-label="Invitations">
          {invitations.data.map((invitation) => (
            <InvitationRow key={invitation.id} studyId={studyId} invitation={invitation} />
          ))}
        </ul>
      )}
    </Card>
  );
}
