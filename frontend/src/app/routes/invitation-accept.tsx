import { Alert, Button, Skeleton, Typography } from 'antd';
import { Link, useLocation, useNavigate, useSearchParams } from 'react-router-dom';
import { PublicFrame } from '@/components/public-frame';
import { paths } from '@/config/paths';
import { useToken } from '@/features/auth/hooks/use-session';
import { useAcceptInvitationSignedIn, useInvitationPreview } from '@/features/invitations/api/accept-invitation';
import { AcceptInvitationForm } from '@/features/invitations/components/accept-invitation-form';
import { getStudies } from '@/features/studies/api/get-studies';
import { ApiRequestError } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { formatDateTime } from '@/lib/format';
import '@/features/invitations/components/invitations.css';

/** What a refused link means and what to do about it. */
function LinkProblem({ error }: { error: unknown }) {
  const gone = error instanceof ApiRequestError && error.status === 410;
  const unknown = error instanceof ApiRequestError && error.status === 404;
  const title = gone ? error.message : unknown ? 'This invitation link is not known.' : describeError(error).problem;
  const remedy = gone
    ? 'Ask the person who invited you to resend the invitation; the new e-mail has a fresh link. If you already accepted it, sign in.'
    : unknown
      ? 'It may have been replaced by a newer one: use the link in the newest invitation e-mail, or ask for a new invitation.'
      : describeError(error).remedy;
  return (
    <>
      <Alert type="error" showIcon role="alert" title={title} description={remedy} className="sign-in__notice" />
      <Link to={paths.signIn.getHref()}>Go to sign-in</Link>
    </>
  );
}

function InvitationAcceptRoute() {
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const location = useLocation();
  const navigate = useNavigate();
  const signedIn = !!useToken();
  const preview = useInvitationPreview(token);
  const acceptSignedIn = useAcceptInvitationSignedIn();

  /** After accepting as a new person: straight into the study (their only one). */
  const openStudy = async () => {
    const studies = await getStudies().catch(() => []);
    navigate(studies.length === 1 ? paths.study.getHref(studies[0]!.id) : paths.studies.getHref(), { replace: true });
  };

  if (!token) {
    return (
      <PublicFrame title="Invitation">
        <Alert type="error" showIcon title="This link has no invitation token." description="Open the link from the invitation e-mail in full; some mail programs cut long links." />
      </PublicFrame>
    );
  }
  if (preview.isPending) {
    return (
      <PublicFrame title="Invitation">
        <Skeleton active paragraph={{ rows: 4 }} />
      </PublicFrame>
    );
  }
  if (preview.isError) {
    return (
      <PublicFrame title="Invitation">
        <LinkProblem error={preview.error} />
      </PublicFrame>
    );
  }
  const p = preview.data;
  const facts = (
    <>
      <Typography.Paragraph>
        <strong>{p.invitedByName}</strong> invites <strong>{p.email}</strong> into the study <strong>“{p.studyName}”</strong> as{' '}
        {p.role === 'viewer' ? 'a viewer (you can look at its runs and evidence)' : 'a member (you can fork and resume runs within your own quota, and record verdicts)'}.
      </Typography.Paragraph>
      <Typography.Paragraph type="secondary">This link works once, until {formatDateTime(p.expiresAt)}.</Typography.Paragraph>
    </>
  );

  if (p.accountExists) {
    const failure = acceptSignedIn.error ? describeError(acceptSignedIn.error) : null;
    return (
      <PublicFrame title={`Join “${p.studyName}”`}>
        {facts}
        {signedIn ? (
          <>
            {failure ? <Alert type="error" showIcon role="alert" className="sign-in__notice" title={failure.problem} description={failure.remedy} /> : null}
            <Button
              type="primary"
              block
              loading={acceptSignedIn.isPending}
              onClick={() => acceptSignedIn.mutate(token, { onSuccess: ({ studyId }) => navigate(paths.study.getHref(studyId), { replace: true }) })}
            >
              Accept and open the study
            </Button>
            <Typography.Paragraph type="secondary" className="public-card__facts">
              You must be signed in as {p.email}; if you are signed in as someone else, sign out first.
            </Typography.Paragraph>
          </>
        ) : (
          <>
            <Alert type="info" showIcon className="sign-in__notice" title={`You already have a Kiln account with ${p.email}.`} description="Sign in with it; you come back here to accept." />
            <Button type="primary" block onClick={() => navigate(paths.signIn.getHref(location.pathname + location.search))}>
              Sign in to accept
            </Button>
          </>
        )}
      </PublicFrame>
    );
  }

  return (
    <PublicFrame title={`Join “${p.studyName}”`}>
      {facts}
      {signedIn ? (
        <Alert
          type="warning"
          showIcon
          className="sign-in__notice"
          title="You are signed in as someone else."
          description={`This invitation is for ${p.email}, who has no account yet. Sign out first if you want to create it in this browser.`}
        />
      ) : null}
      <AcceptInvitationForm token={token} preview={p} onAccepted={() => void openStudy()} />
    </PublicFrame>
  );
}

export { InvitationAcceptRoute as Component };
