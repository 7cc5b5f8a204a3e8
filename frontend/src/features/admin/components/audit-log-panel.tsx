import type { AuditEntry, User } from '@kiln/shared';
import { Button, Card, Input, Select, Skeleton, Table, type TableColumnsType } from 'antd';
import { useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';
import { QueryError } from '@/components/query-error';
import { formatAge, formatDateTime, plural } from '@/lib/format';
import { usePeople } from '../api/get-people';
import { useAuditLog, type AuditSearch } from '../api/get-audit-log';
import { AuditChange } from './audit-change';
import { useNow } from './use-now';

const PAGE_SIZE = 25;

/** The actions Kiln records so far, in words; others are shown by their code. */
const actionLabel: Record<string, string> = {
  'quota.set': 'Quota set',
  'person.update': 'Person changed',
};

/** Local calendar days to the API's instants: `to` includes the whole day. */
function toSearch(params: URLSearchParams): AuditSearch {
  const day = (value: string | null, plusDays = 0) => {
    if (!value || !/^\d{4}-\d{2}-\d{2}$/.test(value)) return undefined;
    const date = new Date(`${value}T00:00:00`);
    date.setDate(date.getDate() + plusDays);
    return Number.isNaN(date.getTime()) ? undefined : date.toISOString();
  };
  const page = Number(params.get('page'));
  return {
    action: params.get('action') || undefined,
    subjectId: params.get('person') || undefined,
    actorId: params.get('by') || undefined,
    from: day(params.get('from')),
    to: day(params.get('to'), 1),
    page: Number.isInteger(page) && page > 1 ? page : 1,
    pageSize: PAGE_SIZE,
  };
}

/** The audit log, newest first, filtered by action, person and days; the filters live in the address so a view can be shared. */
export function AuditLogPanel() {
  const [params, setParams] = useSearchParams();
  const search = useMemo(() => toSearch(params), [params]);
  const audit = useAuditLog(search);
  const people = usePeople();
  const now = useNow(30_000);
  const names = useMemo(() => new Map((people.data ?? []).map((p: User) => [p.id, p.name])), [people.data]);

  function setFilter(key: string, value: string | undefined) {
    setParams(
      (current) => {
        const next = new URLSearchParams(current);
        if (value) next.set(key, value);
        else next.delete(key);
        if (key !== 'page') next.delete('page');
        return next;
      },
      { replace: key !== 'page' },
    );
  }

  const personOptions = (people.data ?? [])
    .slice()
    .sort((a, b) => a.name.localeCompare(b.name))
    .map((p) => ({ value: p.id, label: p.name }));
  const actionOptions = Object.entries(actionLabel).map(([value, label]) => ({ value, label: `${label} (${value})` }));
  const filtered = ['action', 'person', 'by', 'from', 'to'].some((key) => params.get(key));

  const columns: TableColumnsType<AuditEntry> = [
    {
      title: 'When',
      key: 'at',
      width: 170,
      className: 'numeric-cell',
      render: (_, entry) => (
        <>
          <div>{formatDateTime(entry.at)}</div>
          <div className="table-sub">{formatAge(entry.at, now)}</div>
        </>
      ),
    },
    {
      title: 'Changed by',
      key: 'actor',
      width: 150,
      render: (_, entry) => entry.actorName ?? (entry.actorId ? <span className="mono">{entry.actorId.slice(0, 8)}</span> : <span className="muted">Kiln itself</span>),
    },
    {
      title: 'What',
      key: 'action',
      width: 210,
      render: (_, entry) => (
        <>
          <div className="strong-text">{actionLabel[entry.action] ?? entry.action}</div>
          <div className="table-sub">
            {entry.subjectType === 'user' && entry.subjectId ? `for ${names.get(entry.subjectId) ?? 'a person no longer listed'}` : entry.subjectId ? `${entry.subjectType} ${entry.subjectId.slice(0, 8)}` : entry.subjectType}
          </div>
        </>
      ),
    },
    {
      title: 'Before → after',
      key: 'change',
      render: (_, entry) => <AuditChange before={entry.before} after={entry.after} />,
    },
  ];

  return (
    <Card
      title="Audit log"
      className="panel"
      extra={audit.data ? <span className="panel__meta">{plural(audit.data.total, 'entry', 'entries')}{filtered ? (audit.data.total === 1 ? ' matches' : ' match') : ''}</span> : null}
    >
      <form className="audit-filters" aria-label="Filter the audit log" onSubmit={(event) => event.preventDefault()}>
        <label className="audit-filters__field">
          <span className="inline-label">Action</span>
          <Select
            allowClear
            placeholder="Any action"
            value={params.get('action') ?? undefined}
            options={actionOptions}
            onChange={(value?: string) => setFilter('action', value)}
            style={{ width: 190 }}
            aria-label="Action"
          />
        </label>
        <label className="audit-filters__field">
          <span className="inline-label">Concerning</span>
          <Select
            allowClear
            showSearch={{ optionFilterProp: 'label' }}
            placeholder="Anyone"
            value={params.get('person') ?? undefined}
            options={personOptions}
            onChange={(value?: string) => setFilter('person', value)}
            style={{ width: 160 }}
            aria-label="Concerning"
          />
        </label>
        <label className="audit-filters__field">
          <span className="inline-label">Changed by</span>
          <Select
            allowClear
            showSearch={{ optionFilterProp: 'label' }}
            placeholder="Anyone"
            value={params.get('by') ?? undefined}
            options={personOptions}
            onChange={(value?: string) => setFilter('by', value)}
            style={{ width: 160 }}
            aria-label="Changed by"
          />
        </label>
        <label className="audit-filters__field">
          <span className="inline-label">From</span>
          <Input type="date" value={params.get('from') ?? ''} onChange={(e) => setFilter('from', e.target.value)} style={{ width: 140 }} aria-label="From day" />
        </label>
        <label className="audit-filters__field">
          <span className="inline-label">to</span>
          <Input type="date" value={params.get('to') ?? ''} onChange={(e) => setFilter('to', e.target.value)} style={{ width: 140 }} aria-label="To day" />
        </label>
        {filtered ? (
          <Button type="link" onClick={() => setParams(new URLSearchParams(), { replace: true })}>
            Clear filters
          </Button>
        ) : null}
      </form>
      {audit.isPending ? (
        <Skeleton active title={false} paragraph={{ rows: 6 }} />
      ) : audit.isError ? (
        <QueryError what="the audit log" error={audit.error} onRetry={() => void audit.refetch()} />
      ) : (
        <Table<AuditEntry>
          rowKey="id"
          size="small"
          className="audit-table"
          columns={columns}
          dataSource={audit.data.items}
          loading={audit.isFetching && audit.isPlaceholderData}
          pagination={{
            current: audit.data.page,
            pageSize: PAGE_SIZE,
            total: audit.data.total,
            showSizeChanger: false,
            hideOnSinglePage: true,
            showTotal: (total, [first, last]) => `${first}–${last} of ${total}`,
            onChange: (page) => setFilter('page', page > 1 ? String(page) : undefined),
          }}
          locale={{
            emptyText: filtered
              ? 'No change matches these filters. Widen the days or clear a filter.'
              : 'Nothing has been changed yet. Quota, role and access changes made on these pages are recorded here with who made them.',
          }}
        />
      )}
    </Card>
  );
}
