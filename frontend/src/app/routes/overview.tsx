import { Role, type Run } from '@kiln/shared';
import { Button, Card, Skeleton, Tabs } from 'antd';
import { useNavigate } from 'react-router-dom';
import { EvidenceCaution } from '@/components/evidence-caution';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { paths } from '@/config/paths';
import { meQueryOptions, useMe } from '@/features/auth/api/get-me';
import { NewCandidatesPanel } from '@/features/candidates/components/new-candidates-panel';
import { healthQueryOptions } from '@/features/health/api/get-health';
import { ServiceHealthPanel } from '@/features/health/components/service-health-panel';
import { useMyQuota } from '@/features/overview/api/get-my-quota';
import { SlotUsePanel } from '@/features/overview/components/slot-use-panel';
import { useRuns, type RunSearch } from '@/features/runs/api/get-runs';
import { RunsList } from '@/features/runs/components/runs-list';
import { useStudies } from '@/features/studies/api/get-studies';
import { useSweepPreview } from '@/features/sweeps/api/preview-sweep';
import { WorkerPoolPanel } from '@/features/workers/components/worker-pool-panel';
import { getToken } from '@/lib/session';
import type { UseQueryResult } from '@tanstack/react-query';
import type { Page } from '@kiln/shared';
import { queryClient } from '../query-client';

/** Starts the first requests while the page's code is still loading. */
export function loader() {
  if (getToken()) {
    void queryClient.prefetchQuery(meQueryOptions());
    void queryClient.prefetchQuery(healthQueryOptions());
  }
  return null;
}

const mine = (query: RunSearch): RunSearch => ({ scope: 'mine', sort: 'created', order: 'desc', pageSize: 8, ...query });

function RunsTab({ runs, emptyText, showWait }: { runs: UseQueryResult<Page<Run>>; emptyText: string; showWait?: boolean }) {
  if (runs.isPending) return <Skeleton active paragraph={{ rows: 3 }} />;
  if (runs.isError) return <QueryError what="your runs" error={runs.error} onRetry={() => void runs.refetch()} />;
  return (
    <>
      <RunsList runs={runs.data.items} emptyText={emptyText} showWait={showWait} />
      {runs.data.total > runs.data.items.length ? (
        <p className="panel__note">
          Showing the {runs.data.items.length} newest of {runs.data.total}; open a study or sweep to see them all.
        </p>
      ) : null}
    </>
  );
}

/**
 * Where `GET /api/quota` is missing (an older server), the slot cap comes with the
 * sweep preview, which writes nothing; collaborators, who cannot preview, see counts only.
 */
function useMySlots(enabled: boolean, studyId: string | undefined): number | null {
  const preview = useSweepPreview(
    enabled && studyId
      ? {
          studyId,
          base: { domain: { kind: 'sphere', dim: 3 }, target: { kind: 'sphere' }, initial: { kind: 'identity' }, grid: { points: 20 }, time: { tMax: 1 } },
          axes: [],
          priority: 0,
        }
      : null,
  );
  return preview.data?.quota.slots ?? null;
}

function OverviewRoute() {
  const me = useMe();
  const navigate = useNavigate();
  const live = { live: true };
  const running = useRuns(mine({ state: 'running' }), live);
  const queued = useRuns(mine({ state: 'queued', pageSize: 1 }), live);
  const waiting = useRuns(mine({ state: 'waiting' }), live);
  const finished = useRuns(mine({ state: 'finished', sort: 'created' }), live);
  const blowups = useRuns({ scope: 'all', outcome: 'blowup', sort: 'created', order: 'desc', pageSize: 6 }, live);
  const studies = useStudies();
  const researcher = me.data?.role === Role.Admin || me.data?.role === Role.Researcher;
  const quota = useMyQuota();
  const slots = useMySlots(researcher && quota.data === null, studies.data?.[0]?.id);

  const nothingYet = running.data?.total === 0 && waiting.data?.total === 0 && finished.data?.total === 0 && queued.data?.total === 0;

  return (
    <div className="page page--wide">
      <title>Overview · Kiln</title>
      {me.isPending ? (
        <Skeleton active title={{ width: 320 }} paragraph={{ rows: 1, width: 420 }} />
      ) : me.isError ? (
        <QueryError what="your account" error={me.error} onRetry={() => void me.refetch()} />
      ) : (
        <PageHeader
          title={`Welcome back, ${me.data.name}`}
          subtitle="Your runs, possible singularities across your studies, and the machines they run on."
          extra={
            <Button type={nothingYet ? 'primary' : 'default'} onClick={() => navigate(paths.studies.getHref())}>
              {researcher ? 'Studies and sweeps' : 'Your studies'}
            </Button>
          }
        />
      )}
      <div className="page__grid">
        <div className="page__main">
          <Card title="Your runs" className="panel" size="small">
            {nothingYet ? (
              <div className="empty-state">
                <div className="empty-state__heading">You have no runs yet.</div>
                <div className="empty-state__body">
                  {researcher
                    ? 'Open a study and start a sweep: pick a base spec, the fields to vary, and check the run count and CPU estimate before submitting.'
                    : 'Open a study you were invited to, pick a run and fork it from a checkpoint, or resume a paused one; the runs you start appear here.'}
                </div>
              </div>
            ) : (
              <Tabs
                size="small"
                items={[
                  {
                    key: 'running',
                    label: `Computing (${running.data?.total ?? '…'})`,
                    children: <RunsTab runs={running} emptyText="None of your runs is computing right now." />,
                  },
                  {
                    key: 'waiting',
                    label: `Waiting (${waiting.data?.total ?? '…'}) · in queue (${queued.data?.total ?? '…'})`,
                    children: <RunsTab runs={waiting} showWait emptyText="Nothing of yours is waiting for a slot." />,
                  },
                  {
                    key: 'finished',
                    label: `Recently finished (${finished.data?.total ?? '…'})`,
                    children: <RunsTab runs={finished} emptyText="No finished runs yet." />,
                  },
                ]}
              />
            )}
          </Card>
          <NewCandidatesPanel />
          <Card title="Possible singularities" className="panel" size="small" extra={<span className="panel__meta">newest runs whose outcome is blow-up</span>}>
            <RunsTab runs={blowups} emptyText="No run in your studies has ended in blow-up." />
            <EvidenceCaution blowup compact />
          </Card>
          <ServiceHealthPanel />
        </div>
        <div className="page__side">
          <SlotUsePanel running={running.data?.total} queued={queued.data?.total} waiting={waiting.data?.total} slots={slots} quota={quota.data} />
          <WorkerPoolPanel />
        </div>
      </div>
    </div>
  );
}

export { OverviewRoute as Component };
