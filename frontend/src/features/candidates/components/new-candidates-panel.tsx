import { Card, Skeleton } from 'antd';
import { Link } from 'react-router-dom';
import { QueryError } from '@/components/query-error';
import { paths } from '@/config/paths';
import { formatAge, shortId } from '@/lib/format';
import { useCandidates } from '../api/get-candidates';
import { formatConfidence, formatEstimate } from './candidate-format';
import { KindTag } from './candidate-tags';

/** Overview: the newest candidates nobody has judged yet (the blow-up panel beside it carries the evidence caution). */
export function NewCandidatesPanel() {
  const candidates = useCandidates({ verdict: 'none', sort: 'created', order: 'desc', pageSize: 5 });
  return (
    <Card
      title="New candidates"
      className="panel"
      size="small"
      extra={<Link to={paths.candidates.getHref()}>Open the queue</Link>}
    >
      {candidates.isPending ? (
        <Skeleton active paragraph={{ rows: 2 }} />
      ) : candidates.isError ? (
        <QueryError what="the candidates" error={candidates.error} onRetry={() => void candidates.refetch()} />
      ) : candidates.data.items.length === 0 ? (
        <p className="muted">No candidate is awaiting a verdict. Runs flagged as possible singularities appear here.</p>
      ) : (
        <ul className="candidate-mini-list">
          {candidates.data.items.map((c) => (
            <li key={c.id}>
              <Link to={paths.candidate.getHref(c.id)} className="strong-link">
                Run {shortId(c.runId)}
              </Link>
              <KindTag kind={c.kind} />
              <span className="numeric-cell">T̂ {formatEstimate(c.T, c.TUncertainty)}</span>
              <span className="muted numeric-cell">{formatConfidence(c.confidence)} · {formatAge(c.createdAt)}</span>
            </li>
          ))}
        </ul>
      )}
      {candidates.data && candidates.data.total > candidates.data.items.length ? (
        <p className="panel__note">{candidates.data.total} awaiting a verdict in all.</p>
      ) : null}
    </Card>
  );
}
