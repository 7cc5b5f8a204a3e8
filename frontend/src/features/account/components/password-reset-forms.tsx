import { newPasswordSchema, passwordResetRequestSchema } from '@kiln/shared';
import { Alert, Button, Form, Input, type FormRule } from 'antd';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { ApiRequestError } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { useConfirmPasswordReset, useRequestPasswordReset } from '../api/password-reset';

const schemaRule =
  (schema: { safeParse: (value: unknown) => { success: boolean; error?: { issues: { message: string }[] } } }): FormRule =>
  () => ({
    validator: async (_rule, value: unknown) => {
      const result = schema.safeParse(value ?? '');
      if (!result.success) throw new Error(result.error?.issues[0]?.message ?? 'invalid');
    },
  });

/** Asks for a reset link. The answer is the same whether or not the address has an account. */
export function RequestResetForm() {
  const request = useRequestPasswordReset();
  const [sentTo, setSentTo] = useState<string | null>(null);

  if (sentTo) {
    return (
      <>
        <Alert
          type="success"
          showIcon
          role="status"
          className="sign-in__notice"
          title="If this address has a Kiln account, a reset link is on its way."
          description={`Look for an e-mail to ${sentTo} and open its link within the hour. Nothing arrived? Check the spam folder, or ask your lab admin.`}
        />
        <Link to={paths.signIn.getHref()}>Back to sign-in</Link>
      </>
    );
  }
  const failure = request.error ? describeError(request.error) : null;
  return (
    <Form<{ email: string }>
      layout="vertical"
      requiredMark={false}
      validateTrigger="onBlur"
      disabled={request.isPending}
      onFinish={async ({ email }) => {
        const body = passwordResetRequestSchema.safeParse({ email });
        if (!body.success) return;
        try {
          await request.mutateAsync(body.data.email);
          setSentTo(body.data.email);
        } catch {
          // Shown below.
        }
      }}
    >
      <Form.Item label="E-mail" name="email" rules={[schemaRule(passwordResetRequestSchema.shape.email)]} validateFirst>
        <Input autoComplete="username" autoFocus inputMode="email" spellCheck={false} autoCapitalize="off" />
      </Form.Item>
      {failure ? <Alert type="error" showIcon role="alert" className="sign-in-form__failure" title={failure.problem} description={failure.remedy} /> : null}
      <Button type="primary" htmlType="submit" block loading={request.isPending}>
        Send reset link
      </Button>
      <p style={{ marginTop: 16, textAlign: 'center' }}>
        <Link to={paths.signIn.getHref()}>Back to sign-in</Link>
      </p>
    </Form>
  );
}

interface NewPasswordValues {
  password: string;
  repeat: string;
}

/** Chooses a new password with the e-mailed link's token. */
export function ConfirmResetForm({ token }: { token: string }) {
  const confirm = useConfirmPasswordReset();
  const [done, setDone] = useState(false);

  if (done) {
    return (
      <>
        <Alert type="success" showIcon role="status" className="sign-in__notice" title="Your password was changed." description="Sign in with the new one." />
        <Link to={paths.signIn.getHref()}>
          <Button type="primary" block>
            Go to sign-in
          </Button>
        </Link>
      </>
    );
  }
  const error = confirm.error;
  // A used, expired or unknown link: 410 or 404, or 400 about the token rather than the password.
  const linkGone =
    error instanceof ApiRequestError &&
    (error.status === 410 || error.status === 404 || (error.status === 400 && !error.details.some((d) => d.path === 'password')));
  return (
    <Form<NewPasswordValues>
      layout="vertical"
      requiredMark={false}
      validateTrigger="onBlur"
      disabled={confirm.isPending}
      onFinish={async ({ password }) => {
        try {
          await confirm.mutateAsync({ token, password });
          setDone(true);
        } catch {
          // Shown below.
        }
      }}
    >
      <Form.Item label="New password" name="password" rules={[schemaRule(newPasswordSchema)]} validateFirst extra="At least 10 characters.">
        <Input.Password autoComplete="new-password" autoFocus />
      </Form.Item>
      <Form.Item
        label="Repeat the new password"
        name="repeat"
        dependencies={['password']}
        rules={[
          ({ getFieldValue }) => ({
            validator: async (_rule, value: string) => {
              if (value !== getFieldValue('password')) throw new Error('the two passwords differ');
            },
          }),
        ]}
      >
        <Input.Password autoComplete="new-password" />
      </Form.Item>
      {error ? (
        <Alert
          type="error"
          showIcon
          role="alert"
          className="sign-in-form__failure"
          title={linkGone ? (error as ApiRequestError).message : describeError(error).problem}
          description={
            linkGone ? (
              <>
                Reset links work once and for a limited time. <Link to={paths.resetPassword.getHref()}>Ask for a new link</Link>.
              </>
            ) : (
              describeError(error).remedy
            )
          }
        />
      ) : null}
      <Button type="primary" htmlType="submit" block loading={confirm.isPending}>
        Set new password
      </Button>
    </Form>
  );
}
