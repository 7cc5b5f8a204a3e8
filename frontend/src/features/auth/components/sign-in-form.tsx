import { loginRequestSchema, type LoginRequest } from '@kiln/shared';
import { Alert, Button, Form, Input, type FormRule } from 'antd';
import { useState } from 'react';
import { ApiRequestError } from '@/lib/api-client';
import { useSignIn } from '../api/sign-in';

// Each field is checked with the same zod schema the API uses, so the form shows
// the API's own messages before anything is sent.
const fieldRule =
  (field: keyof LoginRequest): FormRule =>
  () => ({
    validator: async (_rule, value: unknown) => {
      const result = loginRequestSchema.shape[field].safeParse(value ?? '');
      if (!result.success) throw new Error(result.error.issues[0]?.message ?? 'invalid');
    },
  });

interface FailureText {
  title: string;
  description: string;
}

function explainSignInFailure(error: unknown): FailureText {
  if (error instanceof ApiRequestError) {
    if (error.isNetworkError) {
      return {
        title: "Kiln's server could not be reached.",
        description:
          'Check your network connection (and VPN, if the lab server needs one) and try again. If it still fails, ask your lab admin whether Kiln is running.',
      };
    }
    if (error.status === 401) {
      return { title: 'E-mail or password is wrong.', description: 'Check both and try again.' };
    }
    if (error.status === 429) {
      return {
        title: 'Too many failed sign-ins.',
        description: 'Kiln has paused sign-in after several failed attempts. Wait a minute, then try again.',
      };
    }
    if (error.status === 400) {
      return { title: 'Kiln could not accept this sign-in.', description: error.message };
    }
    if (error.status === 403) {
      return { title: 'This account cannot sign in.', description: `${error.message} Ask your lab admin.` };
    }
    return {
      title: `Kiln's server had a problem (${error.status}).`,
      description: `${error.message} Try again in a minute; if it keeps happening, tell your lab admin.`,
    };
  }
  return { title: 'Sign-in failed.', description: error instanceof Error ? error.message : String(error) };
}

export function SignInForm({ onSignedIn }: { onSignedIn: (name: string) => void }) {
  const [form] = Form.useForm<LoginRequest>();
  const signIn = useSignIn();
  const [failure, setFailure] = useState<FailureText | null>(null);

  const submit = async (values: LoginRequest) => {
    setFailure(null);
    try {
      // mutateAsync rather than mutate's callbacks: a successful sign-in re-renders
      // the page into a redirect, and the callbacks would not run once unmounted.
      const response = await signIn.mutateAsync(loginRequestSchema.parse(values));
      onSignedIn(response.user.name);
    } catch (error) {
      if (error instanceof ApiRequestError && error.status === 400 && error.details.length > 0) {
        form.setFields(
          error.details
            .filter((detail) => detail.path === 'email' || detail.path === 'password')
            .map((detail) => ({ name: detail.path as keyof LoginRequest, errors: [detail.message] })),
        );
      }
      setFailure(explainSignInFailure(error));
    }
  };

  return (
    <Form<LoginRequest>
      form={form}
      layout="vertical"
      requiredMark={false}
      validateTrigger="onBlur"
      onFinish={submit}
      onValuesChange={() => failure && setFailure(null)}
      disabled={signIn.isPending}
      className="sign-in-form"
    >
      {/* A text input, not type="email": the browser's own check would pre-empt the schema's message. */}
      <Form.Item label="E-mail" name="email" rules={[fieldRule('email')]} validateFirst>
        <Input autoComplete="username" autoFocus inputMode="email" spellCheck={false} autoCapitalize="off" />
      </Form.Item>
      <Form.Item label="Password" name="password" rules={[fieldRule('password')]} validateFirst>
        <Input.Password autoComplete="current-password" />
      </Form.Item>
      {failure ? (
        <Alert
          type="error"
          showIcon
          role="alert"
          className="sign-in-form__failure"
          title={failure.title}
          description={failure.description}
        />
      ) : null}
      <Button type="primary" htmlType="submit" block loading={signIn.isPending}>
        Sign in
      </Button>
    </Form>
  );
}
