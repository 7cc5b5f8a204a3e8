import { BLOWUP_KINDS, type CandidateListQuery } from '@kiln/shared';
import { useQuery } from '@tanstack/react-query';
import { Card, Select } from 'antd';
import { useSearchParams } from 'react-router-dom';
import { EvidenceCaution } from '@/components/evidence-caution';
import { PageHeader } from '@/components/page-header';
import { QueryError } from '@/components/query-error';
import { candidatesQueryOptions, useCandidates, type CandidateSearch } from '@/features/candidates/api/get-candidates';
import { kindLook, verdictLook } from '@/features/candidates/components/candidate-tags';
import { CandidatesTable } from '@/features/candidates/components/candidates-table';
import { useStudies } from '@/features/studies/api/get-studies';
import { studySweepsQueryOptions } from '@/features/sweeps/api/get-sweep';
import { getToken } from '@/lib/session';
import { queryClient } from '../query-client';

type Kind = (typeof BLOWUP_KINDS)[number];
type VerdictFilter = NonNullable<CandidateListQuery['verdict']>;
const VERDICT_FILTERS: VerdictFilter[] = ['none', 'confirmed', 'artefact', 'needs-finer-run'];

/** The queue's filters and order live in the address, so a filtered queue can be shared as a link. */
function readSearch(params: URLSearchParams): CandidateSearch {
  const get = (key: string) => params.get(key) || undefined;
  return {
    studyId: get('studyId'),
    sweepId: get('sweepId'),
    kind: get('kind') as Kind | undefined,
    verdict: get('verdict') as VerdictFilter | undefined,
    sort: (get('sort') as CandidateSearch['sort']) ?? 'confidence',
    order: (get('order') as CandidateSearch['order']) ?? 'desc',
    page: Number(get('page') ?? 1),
    pageSize: Number(get('pageSize') ?? 25),
  };
}

export function loader({ request }: { request: Request }) {
  if (getToken()) void queryClient.prefetchQuery(candidatesQueryOptions(readSearch(new URL(request.url).searchParams)));
  return null;
}

function CandidatesRoute() {
  const [params, setParams] = useSearchParams();
  const query = readSearch(params);
  const candidates = useCandidates(query);
  const studies = useStudies();
  const sweeps = useQuery({ ...studySweepsQueryOptions(query.studyId ?? ''), enabled: !!query.studyId });
  const sweepOptions = query.studyId ? (sweeps.data ?? []) : [];

  const update = (change: CandidateSearch) => {
    const next = { ...query, page: 1, ...change };
    const search = new URLSearchParams();
    for (const [key, value] of Object.entries(next)) if (value !== undefined && value !== null && value !== '') search.set(key, String(value));
    setParams(search, { replace: true });
  };
  const filtered = !!(query.studyId || query.sweepId || query.kind || query.verdict);

  return (
    <div className="page page--wide">
      <title>Candidates · Kiln</title>
      <PageHeader
        title="Blow-up candidates"
        subtitle="Runs flagged as possible singularities, with the engine's fitted blow-up time T̂ and exponent p. Open one to judge its evidence."
      />
      <EvidenceCaution blowup />
      <Card className="panel" size="small" style={{ marginTop: 12 }}>
        <div className="table-filters">
          <label>
            <span className="table-filters__label">Study</span>
            <Select<string>
              aria-label="Filter by study"
              value={query.studyId ?? 'any'}
              style={{ width: 260 }}
              loading={studies.isPending}
              onChange={(v) => update({ studyId: v === 'any' ? undefined : v, sweepId: undefined })}
              options={[{ value: 'any', label: 'All your studies' }, ...(studies.data ?? []).map((s) => ({ value: s.id, label: s.name }))]}
            />
          </label>
          <label>
            <span className="table-filters__label">Sweep</span>
            <Select<string>
              aria-label="Filter by sweep"
              value={query.sweepId ?? 'any'}
              style={{ width: 200 }}
              disabled={!query.studyId}
              title={query.studyId ? undefined : 'Choose a study first'}
              onChange={(v) => update({ sweepId: v === 'any' ? undefined : v })}
              options={[{ value: 'any', label: query.studyId ? 'All sweeps' : 'Choose a study first' }, ...sweepOptions.map((s) => ({ value: s.id, label: s.name }))]}
            />
          </label>
          <label>
            <span className="table-filters__label">Class</span>
            <Select<string>
              aria-label="Filter by class"
              value={query.kind ?? 'any'}
              style={{ width: 200 }}
              onChange={(v) => update({ kind: v === 'any' ? undefined : (v as Kind) })}
              options={[{ value: 'any', label: 'Any class' }, ...BLOWUP_KINDS.map((k) => ({ value: k, label: kindLook[k].label }))]}
            />
          </label>
          <label>
            <span className="table-filters__label">Verdict</span>
            <Select<string>
              aria-label="Filter by verdict"
              value={query.verdict ?? 'any'}
              style={{ width: 200 }}
              onChange={(v) => update({ verdict: v === 'any' ? undefined : (v as VerdictFilter) })}
              options={[
                { value: 'any', label: 'Any verdict' },
                ...VERDICT_FILTERS.map((v) => ({ value: v, label: v === 'none' ? 'Awaiting verdict' : verdictLook[v].label })),
              ]}
            />
          </label>
          <label>
            <span className="table-filters__label">Order</span>
            <Select<string>
              aria-label="Sort by"
              value={`${query.sort}:${query.order}`}
              style={{ width: 210 }}
              onChange={(v) => {
                const [sort, order] = v.split(':') as [CandidateSearch['sort'], CandidateSearch['order']];
                update({ sort, order });
              }}
              options={[
                { value: 'confidence:desc', label: 'Most confident first' },
                { value: 'T:asc', label: 'Earliest T̂ first' },
                { value: 'T:desc', label: 'Latest T̂ first' },
                { value: 'created:desc', label: 'Newest first' },
              ]}
            />
          </label>
          {candidates.isFetching && !candidates.isPending ? <span className="muted">updating…</span> : null}
        </div>
        {candidates.isError ? (
          <QueryError what="the candidates" error={candidates.error} onRetry={() => void candidates.refetch()} />
        ) : (
          <CandidatesTable
            items={candidates.data?.items ?? []}
            total={candidates.data?.total ?? 0}
            loading={candidates.isPending}
            query={query}
            onQueryChange={update}
            emptyText={
              filtered
                ? 'No candidate matches these filters. Choose "All" or "Any" to widen the queue.'
                : 'No candidates yet. Runs that end in blow-up, or whose gradient grows like one while running, appear here.'
            }
          />
        )}
      </Card>
    </div>
  );
}

export { CandidatesRoute as Component };
