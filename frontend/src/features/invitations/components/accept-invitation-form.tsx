import { acceptInvitationSchema, type InvitationPreview } from '@kiln/shared';
import { Alert, Button, Form, Input, type FormRule } from 'antd';
import { describeError } from '@/lib/describe-error';
import { useAcceptInvitation } from '../api/accept-invitation';

interface Values {
  name: string;
  password: string;
}

// Checked with the same zod schema the API uses, so the messages match.
const fieldRule =
  (field: 'name' | 'password'): FormRule =>
  () => ({
    validator: async (_rule, value: unknown) => {
      const result = acceptInvitationSchema.shape[field].safeParse(value ?? '');
      if (!result.success) throw new Error(result.error.issues[0]?.message ?? 'invalid');
    },
  });

/** A new person chooses a name and a password; accepting signs them in. */
export function AcceptInvitationForm({ token, preview, onAccepted }: { token: string; preview: InvitationPreview; onAccepted: () => void }) {
  const [form] = Form.useForm<Values>();
  const accept = useAcceptInvitation();

  const submit = async (values: Values) => {
    const body = acceptInvitationSchema.safeParse({ token, ...values });
    if (!body.success) return;
    try {
      await accept.mutateAsync(body.data);
      onAccepted();
    } catch {
      // Shown below.
    }
  };
  const failure = accept.error ? describeError(accept.error) : null;

  return (
    <Form<Values> form={form} layout="vertical" requiredMark={false} validateTrigger="onBlur" onFinish={submit} disabled={accept.isPending}>
      <Form.Item label="E-mail">
        <Input value={preview.email} disabled autoComplete="username" />
      </Form.Item>
      <Form.Item label="Your name" name="name" rules={[fieldRule('name')]} validateFirst extra="As your colleagues will see it in the study.">
        <Input autoComplete="name" autoFocus />
      </Form.Item>
      <Form.Item label="Choose a password" name="password" rules={[fieldRule('password')]} validateFirst extra="At least 10 characters.">
        <Input.Password autoComplete="new-password" />
      </Form.Item>
      {failure ? <Alert type="error" showIcon role="alert" className="sign-in-form__failure" title="Your account was not created." description={`${failure.problem} ${failure.remedy}`} /> : null}
      <Button type="primary" htmlType="submit" block loading={accept.isPending}>
        Create account and join
      </Button>
    </Form>
  );
}
