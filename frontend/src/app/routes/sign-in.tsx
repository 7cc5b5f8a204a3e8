import { Alert, App, Typography } from 'antd';
import { useEffect, useState } from 'react';
import { Link, Navigate, useSearchParams } from 'react-router-dom';
import { KilnWordmark } from '@/components/kiln-mark';
import { paths, safeRedirectTarget } from '@/config/paths';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { useToken } from '@/features/auth/hooks/use-session';
import { clearSessionEndReason, peekSessionEndReason } from '@/lib/session';

function SignInRoute() {
  const token = useToken();
  const [searchParams] = useSearchParams();
  const { message } = App.useApp();
  const redirectTo = safeRedirectTarget(searchParams.get('redirectTo'));
  // Read once, then forget, so a reload does not repeat the notice.
  const [endReason] = useState(peekSessionEndReason);
  useEffect(() => clearSessionEndReason(), []);

  if (token) return <Navigate to={redirectTo} replace />;

  return (
    <div className="sign-in">
      <title>Sign in · Kiln</title>
      <aside className="sign-in__brand">
        <KilnWordmark inverted size={34} />
        <p className="sign-in__pitch">
          Kiln is your lab&apos;s place to run long harmonic map heat flow simulations on shared workers, keep every
          run checkpointed, and judge possible blow-ups with the evidence in front of you.
        </p>
        <p className="sign-in__fineprint">Self-hosted by your lab. Numerical results are evidence, not proof.</p>
      </aside>
      <main className="sign-in__main">
        <div className="sign-in__card">
          <Typography.Title level={1} className="sign-in__title">
            Welcome to Kiln
          </Typography.Title>
          <Typography.Paragraph type="secondary">Use the account your lab admin set up for you.</Typography.Paragraph>
          {endReason === 'expired' ? (
            <Alert className="sign-in__notice" type="warning" showIcon title="Your session has ended; sign in again." />
          ) : endReason === 'signed-out' ? (
            <Alert className="sign-in__notice" type="info" showIcon title="You have signed out." />
          ) : null}
          <SignInForm onSignedIn={(name) => void message.success(`Signed in as ${name}.`)} />
          <p style={{ marginTop: 16, textAlign: 'center' }}>
            <Link to={paths.resetPassword.getHref()}>Forgot your password?</Link>
          </p>
        </div>
      </main>
    </div>
  );
}

export { SignInRoute as Component };
