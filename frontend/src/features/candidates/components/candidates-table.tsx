import type { Candidate } from '@kiln/shared';
import { Table, type TableColumnsType, type TablePaginationConfig } from 'antd';
import type { SorterResult } from 'antd/es/table/interface';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { formatDateTime, plural, shortId } from '@/lib/format';
import type { CandidateSearch } from '../api/get-candidates';
import { formatConfidence, formatEstimate } from './candidate-format';
import { KindTag, VerdictTag } from './candidate-tags';

type SortKey = 'confidence' | 'T' | 'created';

/** The queue: one row per candidate, sorted and paged on the server. */
export function CandidatesTable({
  items,
  total,
  loading,
  query,
  onQueryChange,
  emptyText,
}: {
  items: Candidate[];
  total: number;
  loading: boolean;
  query: CandidateSearch;
  onQueryChange: (change: CandidateSearch) => void;
  emptyText: string;
}) {
  const sortOrder = (key: SortKey) => ((query.sort ?? 'confidence') === key ? ((query.order ?? 'desc') === 'desc' ? 'descend' : 'ascend') : null);
  const columns: TableColumnsType<Candidate> = [
    {
      title: 'Candidate',
      key: 'candidate',
      render: (_, c) => (
        <div>
          <Link to={paths.candidate.getHref(c.id)} className="strong-link" aria-label={`Candidate of run ${shortId(c.runId)}`}>
            Candidate {shortId(c.id)}
          </Link>
          <div className="table-sub">
            run{' '}
            <Link to={paths.run.getHref(c.runId)} className="mono-link">
              {shortId(c.runId)}
            </Link>
          </div>
        </div>
      ),
    },
    { title: 'Class', key: 'kind', render: (_, c) => <KindTag kind={c.kind} /> },
    {
      title: 'Confidence',
      key: 'confidence',
      sorter: true,
      sortOrder: sortOrder('confidence'),
      className: 'numeric-cell',
      render: (_, c) => formatConfidence(c.confidence),
    },
    { title: 'T̂', key: 'T', sorter: true, sortOrder: sortOrder('T'), className: 'numeric-cell', render: (_, c) => formatEstimate(c.T, c.TUncertainty) },
    { title: 'p', key: 'p', className: 'numeric-cell', render: (_, c) => formatEstimate(c.exponent, c.exponentUncertainty) },
    { title: 'Verdict', key: 'verdict', render: (_, c) => <VerdictTag verdict={c.verdict} /> },
    {
      title: 'Found',
      key: 'created',
      sorter: true,
      sortOrder: sortOrder('created'),
      render: (_, c) => (
        <div>
          <div>{c.foundWhileRunning ? 'while running' : 'at the end'}</div>
          <div className="table-sub">{formatDateTime(c.createdAt)}</div>
        </div>
      ),
    },
  ];

  const onChange = (pagination: TablePaginationConfig, _filters: unknown, sorter: SorterResult<Candidate> | SorterResult<Candidate>[]) => {
    const s = Array.isArray(sorter) ? sorter[0] : sorter;
    const sort = (s?.order ? (s.columnKey as SortKey) : 'confidence') ?? 'confidence';
    onQueryChange({
      sort,
      order: s?.order === 'ascend' ? 'asc' : 'desc',
      page: pagination.current ?? 1,
      pageSize: pagination.pageSize ?? 25,
    });
  };

  return (
    <Table<Candidate>
      rowKey="id"
      size="small"
      className="candidates-table"
      columns={columns}
      loading={loading}
      dataSource={items}
      onChange={onChange}
      pagination={{
        current: query.page ?? 1,
        pageSize: query.pageSize ?? 25,
        total,
        showSizeChanger: true,
        pageSizeOptions: [25, 50, 100, 200],
        showTotal: (n) => plural(n, 'candidate', 'candidates'),
      }}
      locale={{ emptyText }}
    />
  );
}
