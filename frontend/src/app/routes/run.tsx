import { Role, type CheckpointInfo, type FlowSummary } from '@kiln/shared';
import { useQueryClient } from '@tanstack/react-query';
import { Alert, Breadcrumb, Card, Skeleton } from 'antd';
import { useState } from 'react';
import { Link, useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { OutcomeTag, RunStateTag } from '@/components/run-status';
import { StatusTag } from '@/components/status-tag';
import { paths } from '@/config/paths';
import { useMe } from '@/features/auth/api/get-me';
import { isResting, runQueryOptions, useRun } from '@/features/runs/api/get-run';
import { useRunCheckpoints } from '@/features/runs/api/get-run-checkpoints';
import { useRunMetrics } from '@/features/runs/api/get-run-metrics';
import { useRunEvents, type LiveStatus } from '@/features/runs/api/use-run-events';
import { CheckpointsTable } from '@/features/runs/components/checkpoints-table';
import { ForkDialog } from '@/features/runs/components/fork-dialog';
import { OutcomePanel } from '@/features/runs/components/outcome-panel';
import { ProfileSnapshots } from '@/features/runs/components/profile-snapshots';
import { RunControls } from '@/features/runs/components/run-controls';
import { RunMetricsCharts } from '@/features/runs/components/run-metrics-charts';
import { runLabel } from '@/features/runs/components/runs-list';
import { SpecPanel } from '@/features/runs/components/spec-panel';
import { DilationProfilePanel } from '@/features/mobius/components/dilation-profile-panel';
import { ExperimentalOrigin } from '@/features/mobius/components/experimental-origin';
import { MobiusTrajectoryPanel } from '@/features/mobius/components/mobius-trajectory-panel';
import { useStudy } from '@/features/studies/api/get-studies';
import { RunExports } from '@/features/uploads/components/run-exports';
import { formatNumber, shortId } from '@/lib/format';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

export function loader({ params }: LoaderFunctionArgs) {
  if (getToken() && params.runId) void queryClient.prefetchQuery(runQueryOptions(params.runId));
  return null;
}

function LiveTag({ status }: { status: LiveStatus }) {
  switch (status) {
    case 'live':
      return <StatusTag tone="info" label="Live" title="Following the run's events as they happen" />;
    case 'connecting':
      return <StatusTag tone="idle" label="Connecting…" />;
    case 'reconnecting':
      return <StatusTag tone="warn" label="Reconnecting…" title="The live stream dropped; reads every few seconds continue meanwhile" />;
    case 'off':
      return null;
  }
}

function ParentNote({ parentRunId, parentCheckpointId }: { parentRunId: string; parentCheckpointId: string }) {
  const checkpoints = useRunCheckpoints(parentRunId);
  const seq = checkpoints.data?.find((c) => c.id === parentCheckpointId)?.seq;
  return (
    <Alert
      type="info"
      showIcon
      className="parent-note"
      title={
        <span data-testid="parent-link">
          Forked from{' '}
          {seq !== undefined ? `checkpoint #${seq}` : 'a checkpoint'} of run{' '}
          <Link to={paths.run.getHref(parentRunId)} className="mono-link">
            {shortId(parentRunId)}
          </Link>
        </span>
      }
    />
  );
}

function RunRoute() {
  const { runId = '' } = useParams();
  const navigate = useNavigate();
  const client = useQueryClient();
  const run = useRun(runId);
  const me = useMe();
  const study = useStudy(run.data?.studyId);
  const live = !!run.data && !isResting(run.data);
  const liveStatus = useRunEvents(runId, live);
  const metrics = useRunMetrics(runId, client, { live });
  const checkpoints = useRunCheckpoints(runId);
  const [forkFrom, setForkFrom] = useState<CheckpointInfo | null>(null);

  if (run.isPending) return <Skeleton active paragraph={{ rows: 12 }} />;
  if (run.isError) return <QueryError what="this run" error={run.error} onRetry={() => void run.refetch()} />;
  const r = run.data;
  const myRole = study.data?.myRole;
  const canWork = myRole === 'owner' || myRole === 'member' || me.data?.role === Role.Admin;
  const summary = r.summary as FlowSummary | null;
  const blowupT = summary?.blowup?.T ?? null;
  const canResumeCheckpoint = r.state === 'paused' || r.state === 'cancelled' || r.state === 'failed' || (r.state === 'finished' && r.outcome === 'time-limit');

  return (
    <div className="page page--wide">
      <title>{`Run ${shortId(r.id)} · Kiln`}</title>
      <Breadcrumb
        className="page-crumbs"
        items={[
          { title: <Link to={paths.studies.getHref()}>Studies</Link> },
          { title: <Link to={paths.study.getHref(r.studyId)}>{study.data?.name ?? 'Study'}</Link> },
          ...(r.sweepId ? [{ title: <Link to={paths.sweep.getHref(r.sweepId)}>Sweep</Link> }] : []),
          { title: `Run ${shortId(r.id)}` },
        ]}
      />
      <PageHeader
        title={
          <span className="run-title">
            Run <span className="mono">{shortId(r.id)}</span> <RunStateTag state={r.state} /> {r.outcome ? <OutcomeTag outcome={r.outcome} /> : null}
          </span>
        }
        subtitle={`${r.sweepIndex !== null ? `Run ${r.sweepIndex + 1} of its sweep · ` : ''}${runLabel(r)}${r.progress ? ` · t = ${formatNumber(r.progress.t, 4)}, step ${r.progress.step}` : ''}`}
        extra={<RunControls run={r} canWork={canWork} />}
      />
      {r.origin?.kind === 'dilation-jump' ? (
        <ExperimentalOrigin run={r} origin={r.origin} />
      ) : r.parentRunId && r.parentCheckpointId ? (
        <ParentNote parentRunId={r.parentRunId} parentCheckpointId={r.parentCheckpointId} />
      ) : null}
      {r.state === 'waiting' && r.waitReason ? <Alert type="warning" showIcon className="parent-note" title={`Waiting: ${r.waitReason}`} /> : null}
      <div className="page__grid page__grid--run">
        <div className="page__main">
          <Card
            title="Diagnostics"
            className="panel"
            size="small"
            extra={
              <div className="panel__extra">
                <LiveTag status={liveStatus} />
                <span className="panel__meta" data-testid="sample-count">
                  {metrics.data ? `${metrics.data.length} samples` : ''}
                </span>
              </div>
            }
          >
            {metrics.isPending ? (
              <Skeleton active paragraph={{ rows: 6 }} />
            ) : metrics.isError ? (
              <QueryError what="the run's diagnostics" error={metrics.error} onRetry={() => void metrics.refetch()} />
            ) : metrics.data.length === 0 ? (
              <p className="muted">
                {live ? 'No samples yet: the plots start as soon as a worker picks the run up.' : 'This run recorded no samples.'}
              </p>
            ) : (
              <RunMetricsCharts samples={metrics.data} spec={r.spec} blowupT={blowupT} />
            )}
          </Card>
          {r.spec.domain.kind === 'sphere' ? <MobiusTrajectoryPanel run={r} metrics={metrics} /> : null}
          <Card title="Profile snapshots h(r)" className="panel" size="small">
            {checkpoints.isPending ? (
              <Skeleton active paragraph={{ rows: 4 }} />
            ) : checkpoints.isError ? (
              <QueryError what="the run's checkpoints" error={checkpoints.error} onRetry={() => void checkpoints.refetch()} />
            ) : (
              <ProfileSnapshots checkpoints={checkpoints.data} spec={r.spec} />
            )}
          </Card>
          {r.spec.domain.kind === 'sphere' ? (
            <DilationProfilePanel run={r} checkpoints={checkpoints} canWork={canWork} onJumped={(newRunId) => navigate(paths.run.getHref(newRunId))} />
          ) : null}
          <Card
            title="Checkpoints"
            className="panel"
            size="small"
            extra={<span className="panel__meta">{canWork ? 'resume here, or fork a new run with changes' : 'you can look and download'}</span>}
          >
            {checkpoints.isPending ? (
              <Skeleton active paragraph={{ rows: 3 }} />
            ) : checkpoints.isError ? (
              <QueryError what="the run's checkpoints" error={checkpoints.error} onRetry={() => void checkpoints.refetch()} />
            ) : (
              <CheckpointsTable runId={r.id} checkpoints={checkpoints.data} canWork={canWork} canResume={canResumeCheckpoint} onFork={setForkFrom} />
            )}
          </Card>
        </div>
        <div className="page__side">
          <OutcomePanel run={r} />
          <SpecPanel spec={r.spec} />
          <RunExports runId={r.id} checkpoints={checkpoints.data ?? []} />
        </div>
      </div>
      <ForkDialog
        checkpoint={forkFrom}
        spec={r.spec}
        onClose={() => setForkFrom(null)}
        onForked={(newRunId) => {
          setForkFrom(null);
          navigate(paths.run.getHref(newRunId));
        }}
      />
    </div>
  );
}

export { RunRoute as Component };
