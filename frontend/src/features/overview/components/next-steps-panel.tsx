import { Role } from '@kiln/shared';
import { Button, Card, Typography } from 'antd';
import type { ReactNode } from 'react';
import { useNavigate } from 'react-router-dom';
import { paths } from '@/config/paths';

interface NextStep {
  heading: string;
  body: ReactNode;
  action?: ReactNode;
}

// Honest empty states: these capabilities arrive in later releases, so each role is
// told what is not here yet and what they can usefully do today.
function nextStepFor(role: Role, email: string, openLab: () => void): NextStep {
  switch (role) {
    case Role.Researcher:
      return {
        heading: 'No runs yet.',
        body: (
          <>
            <p>
              Sweeps arrive in the next release of Kiln — meanwhile, note the base spec and the axes you want to
              sweep (axis ratio, tension threshold, step size, grid), so you can launch them as soon as sweeps are
              here.
            </p>
            <p>
              The service health on this page shows how many worker slots the lab offers; that is what your sweeps
              will share with everyone else.
            </p>
          </>
        ),
      };
    case Role.Collaborator:
      return {
        heading: 'No studies shared with you yet.',
        body: (
          <>
            <p>
              You only see studies you are invited to. Studies, invitations and checkpoints arrive in the next
              release of Kiln.
            </p>
            <p>
              When they do, the researcher who runs a study invites you by e-mail: make sure they have the address
              you sign in with, <Typography.Text code>{email}</Typography.Text>.
            </p>
          </>
        ),
      };
    case Role.Admin:
      return {
        heading: 'No quotas set yet.',
        body: (
          <>
            <p>
              Quotas (concurrent slots and CPU-hours per person), usage and the audit log arrive in later releases
              of Kiln. No one can launch runs until then.
            </p>
            <p>Meanwhile, check on the Lab page who has an account and whether the services and workers are up.</p>
          </>
        ),
        action: <Button onClick={openLab}>Open Lab</Button>,
      };
  }
}

/** What this person can do next, by role. */
export function NextStepsPanel({ role, email }: { role: Role; email: string }) {
  const navigate = useNavigate();
  const step = nextStepFor(role, email, () => navigate(paths.lab.getHref()));
  return (
    <Card title="Your work" className="panel">
      <div className="empty-state">
        <div className="empty-state__heading">{step.heading}</div>
        <div className="empty-state__body">{step.body}</div>
        {step.action ? <div className="empty-state__action">{step.action}</div> : null}
      </div>
    </Card>
  );
}
