import { Typography } from 'antd';
import { useSearchParams } from 'react-router-dom';
import { KilnWordmark } from '@/components/kiln-mark';
import { ConfirmResetForm, RequestResetForm } from '@/features/account/components/password-reset-forms';

/** Public: without a token, ask for a reset link; with the e-mailed token, choose a new password. */
function ResetPasswordRoute() {
  const [params] = useSearchParams();
  const token = params.get('token');
  const title = token ? 'Choose a new password' : 'Reset your password';
  return (
    <div className="sign-in">
      <title>{`${title} · Kiln`}</title>
      <aside className="sign-in__brand">
        <KilnWordmark inverted size={34} />
        <p className="sign-in__pitch">
          Kiln is a lab&apos;s place to run long harmonic map heat flow simulations on shared workers, keep every run
          checkpointed, and judge possible blow-ups with the evidence in front of you.
        </p>
        <p className="sign-in__fineprint">Numerical results are evidence, not proof.</p>
      </aside>
      <main className="sign-in__main">
        <div className="sign-in__card">
          <Typography.Title level={1} className="sign-in__title">
            {title}
          </Typography.Title>
          <Typography.Paragraph type="secondary">
            {token ? 'The link from your e-mail lets you set a new password once.' : 'Enter the e-mail address of your Kiln account; we mail you a link to choose a new password.'}
          </Typography.Paragraph>
          {token ? <ConfirmResetForm token={token} /> : <RequestResetForm />}
        </div>
      </main>
    </div>
  );
}

export { ResetPasswordRoute as Component };
