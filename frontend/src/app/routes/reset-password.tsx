import { Typography } from 'antd';
import { useSearchParams } from 'react-router-dom';
import { PublicFrame } from '@/components/public-frame';
import { ConfirmResetForm, RequestResetForm } from '@/features/account/components/password-reset-forms';

/** Public: without a token, ask for a reset link; with the e-mailed token, choose a new password. */
function ResetPasswordRoute() {
  const [params] = useSearchParams();
  const token = params.get('token');
  const title = token ? 'Choose a new password' : 'Reset your password';
  return (
    <PublicFrame title={title}>
      <Typography.Paragraph type="secondary">
        {token ? 'The link from your e-mail lets you set a new password once.' : 'Enter the e-mail address of your Kiln account; we mail you a link to choose a new password.'}
      </Typography.Paragraph>
      {token ? <ConfirmResetForm token={token} /> : <RequestResetForm />}
    </PublicFrame>
  );
}

export { ResetPasswordRoute as Component };
