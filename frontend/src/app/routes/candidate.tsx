import { Role } from '@kiln/shared';
import { Breadcrumb, Card, Skeleton } from 'antd';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { EvidenceCaution } from '@/components/evidence-caution';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { OutcomeTag, RunStateTag } from '@/components/run-status';
import { paths } from '@/config/paths';
import { useMe } from '@/features/auth/api/get-me';
import { candidatePlotsQueryOptions, useCandidatePlots } from '@/features/candidates/api/get-candidate-plots';
import { candidateQueryOptions, useCandidate } from '@/features/candidates/api/get-candidate';
import { formatConfidence, formatEstimate } from '@/features/candidates/components/candidate-format';
import { KindTag, VerdictTag } from '@/features/candidates/components/candidate-tags';
import { EngineNotes, EvidenceFacts } from '@/features/candidates/components/evidence-facts';
import { EvidencePlots } from '@/features/candidates/components/evidence-plots';
import { FinerRunPanel } from '@/features/candidates/components/finer-run-panel';
import { VerdictForm } from '@/features/candidates/components/verdict-form';
import { useStudy } from '@/features/studies/api/get-studies';
import { formatDateTime, shortId } from '@/lib/format';
import { getToken } from '@/lib/session';
import type { FlowOutcome, RunState } from '@kiln/shared';
import { queryClient } from '../query-client';

export function loader({ params }: LoaderFunctionArgs) {
  if (getToken() && params.candidateId) {
    void queryClient.prefetchQuery(candidateQueryOptions(params.candidateId));
    void queryClient.prefetchQuery(candidatePlotsQueryOptions(params.candidateId));
  }
  return null;
}

function CandidateRoute() {
  const { candidateId = '' } = useParams();
  const candidate = useCandidate(candidateId);
  const runComputing = !!candidate.data && !['finished', 'failed', 'cancelled'].includes(candidate.data.runState);
  const plots = useCandidatePlots(candidateId, runComputing);
  const me = useMe();
  const study = useStudy(candidate.data?.studyId);

  if (candidate.isPending) return <Skeleton active paragraph={{ rows: 12 }} />;
  if (candidate.isError) return <QueryError what="this candidate" error={candidate.error} onRetry={() => void candidate.refetch()} />;
  const c = candidate.data;
  const myRole = study.data?.myRole;
  const canWork = myRole === 'owner' || myRole === 'member' || me.data?.role === Role.Admin;
  const disabledReason = study.isPending
    ? 'Checking your role in this study…'
    : canWork
      ? null
      : 'You are a viewer in this study: you can read the evidence, but only its owner and members record verdicts and start runs.';

  return (
    <div className="page page--wide">
      <title>{`Candidate of run ${shortId(c.runId)} · Kiln`}</title>
      <Breadcrumb
        className="page-crumbs"
        items={[
          { title: <Link to={paths.candidates.getHref()}>Candidates</Link> },
          ...(study.data ? [{ title: <Link to={paths.study.getHref(c.studyId)}>{study.data.name}</Link> }] : []),
          { title: `Run ${shortId(c.runId)}` },
        ]}
      />
      <PageHeader
        title={
          <span className="candidate-head">
            Candidate from run{' '}
            <Link to={paths.run.getHref(c.runId)} className="mono-link" data-testid="candidate-run-link">
              {shortId(c.runId)}
            </Link>
            <KindTag kind={c.kind} />
            <VerdictTag verdict={c.verdict} />
          </span>
        }
        subtitle={
          <span className="numeric-cell">
            T̂ = {formatEstimate(c.T, c.TUncertainty)} · p = {formatEstimate(c.exponent, c.exponentUncertainty)} · confidence {formatConfidence(c.confidence)} ·
            found {c.foundWhileRunning ? 'while the run was computing' : 'when the run ended'}, {formatDateTime(c.createdAt)}
          </span>
        }
        extra={
          <span className="candidate-head">
            <RunStateTag state={c.runState as RunState} /> {c.runOutcome ? <OutcomeTag outcome={c.runOutcome as FlowOutcome} /> : null}
          </span>
        }
      />
      <EvidenceCaution blowup />
      <div className="page__grid page__grid--run" style={{ marginTop: 12 }}>
        <div className="page__main">
          <Card title="Evidence" className="panel" size="small">
            {plots.isPending ? (
              <Skeleton active paragraph={{ rows: 8 }} />
            ) : plots.isError ? (
              <QueryError what="the evidence plots" error={plots.error} onRetry={() => void plots.refetch()} />
            ) : (
              <EvidencePlots plots={plots.data} exponent={c.exponent} T={c.T} />
            )}
          </Card>
          <Card title="The numbers" className="panel" size="small">
            <EvidenceFacts candidate={c} />
          </Card>
          <Card title="The engine's notes" className="panel" size="small">
            <EngineNotes notes={c.evidence.estimate.evidence.notes} />
          </Card>
        </div>
        <div className="page__side">
          <Card title="Verdict" className="panel" size="small">
            <VerdictForm candidate={c} disabledReason={disabledReason} />
          </Card>
          <Card title="Finer run" className="panel" size="small">
            <FinerRunPanel candidate={c} disabledReason={disabledReason} />
          </Card>
        </div>
      </div>
    </div>
  );
}

export { CandidateRoute as Component };
