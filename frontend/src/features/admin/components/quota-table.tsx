import { DEFAULT_QUOTAS, quotaSchema, type Quota } from '@kiln/shared';
import { App, Button, Card, Input, Skeleton, Table, type TableColumnsType } from 'antd';
import { useState, type ReactNode } from 'react';
import { QueryError } from '@/components/query-error';
import { RoleTag } from '@/components/role-tag';
import { StatusTag } from '@/components/status-tag';
import { ApiRequestError } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { plural } from '@/lib/format';
import { roleLabel } from '@/lib/roles';
import { useQuotas, type PersonQuota } from '../api/get-quotas';
import { useSetQuota } from '../api/set-quota';
import { formatQuotaField, formatRunTime } from './quota-format';
import { UsageMeter } from './usage-meter';

/** What the admin typed into one row, as text until it is checked. */
interface Draft {
  slots: string;
  cpuHoursPerMonth: string;
  maxGridPoints: string;
  runHours: string;
  runMinutes: string;
}

type FieldErrors = Partial<Record<keyof Quota | 'row', string>>;

function draftOf(quota: Quota): Draft {
  const hours = Math.floor(quota.maxRunCpuSeconds / 3600);
  const minutes = (quota.maxRunCpuSeconds - hours * 3600) / 60;
  return {
    slots: String(quota.slots),
    cpuHoursPerMonth: String(quota.cpuHoursPerMonth),
    maxGridPoints: String(quota.maxGridPoints),
    runHours: String(hours),
    runMinutes: String(Number(minutes.toFixed(2))),
  };
}

const sameDraft = (a: Draft, b: Draft) => (Object.keys(a) as (keyof Draft)[]).every((key) => a[key].trim() === b[key].trim());

/** Text to number; blanks and words become NaN so the schema names the field. */
function toNumber(text: string): number {
  const cleaned = text.replace(/[\s_\u2009]/g, '');
  return cleaned === '' ? Number.NaN : Number(cleaned);
}

function quotaOf(draft: Draft) {
  const hours = toNumber(draft.runHours);
  const minutes = toNumber(draft.runMinutes);
  return {
    slots: toNumber(draft.slots),
    cpuHoursPerMonth: toNumber(draft.cpuHoursPerMonth),
    maxGridPoints: toNumber(draft.maxGridPoints),
    maxRunCpuSeconds: Math.round(hours * 3600 + minutes * 60),
  };
}

/** Checks a draft with the API's own schema, so the browser and the server say the same thing. */
function validate(draft: Draft): { quota: Quota } | { errors: FieldErrors } {
  const parsed = quotaSchema.safeParse(quotaOf(draft));
  if (parsed.success) return { quota: parsed.data };
  const errors: FieldErrors = {};
  for (const issue of parsed.error.issues) {
    const field = issue.path[0] as keyof Quota | undefined;
    if (field && !errors[field]) errors[field] = issue.message;
  }
  return { errors };
}

function serverErrors(error: unknown): FieldErrors {
  const errors: FieldErrors = {};
  if (error instanceof ApiRequestError) {
    for (const detail of error.details) {
      const field = detail.path as keyof Quota;
      if (field in DEFAULT_QUOTAS.researcher && !errors[field]) errors[field] = detail.message;
    }
  }
  if (Object.keys(errors).length === 0) {
    const { problem, remedy } = describeError(error);
    errors.row = `${problem} ${remedy}`;
  }
  return errors;
}

function FieldError({ message }: { message: string | undefined }) {
  return message ? (
    <div className="field-error" role="alert">
      {message}
    </div>
  ) : null;
}

function DefaultOrCustom({ row }: { row: PersonQuota }) {
  const defaults = DEFAULT_QUOTAS[row.role];
  const defaultsText = `${roleLabel[row.role]} default: ${formatQuotaField('slots', defaults.slots)}, ${formatQuotaField('cpuHoursPerMonth', defaults.cpuHoursPerMonth)}, grid up to ${defaults.maxGridPoints}, runs up to ${formatRunTime(defaults.maxRunCpuSeconds)}`;
  return row.custom ? (
    <span data-testid="quota-source">
      <StatusTag tone="ember" label="Custom" title={`Set for this person by a lab admin; a role change leaves it as it is. ${defaultsText}.`} />
    </span>
  ) : (
    <span data-testid="quota-source">
      <StatusTag tone="idle" label="Role default" title={`${defaultsText}. Saving this row makes it a custom quota.`} />
    </span>
  );
}

/**
 * Everyone's quota, editable in place: each row keeps its own draft, is checked
 * with the shared `quotaSchema` as the admin types, and is saved on its own.
 */
export function QuotaTable() {
  const quotas = useQuotas();
  const setQuota = useSetQuota();
  const { message } = App.useApp();
  const [drafts, setDrafts] = useState<Record<string, Draft>>({});
  const [errors, setErrors] = useState<Record<string, FieldErrors>>({});
  const [savingId, setSavingId] = useState<string | null>(null);

  const draftFor = (row: PersonQuota) => drafts[row.userId] ?? draftOf(row);

  function edit(row: PersonQuota, patch: Partial<Draft>) {
    const next = { ...draftFor(row), ...patch };
    setDrafts((all) => ({ ...all, [row.userId]: next }));
    // Re-check as they type only once a save attempt has shown errors.
    if (errors[row.userId]) {
      const result = validate(next);
      setErrors((all) => ({ ...all, [row.userId]: 'errors' in result ? result.errors : {} }));
    }
  }

  function discard(row: PersonQuota) {
    setDrafts(({ [row.userId]: _, ...rest }) => rest);
    setErrors(({ [row.userId]: _, ...rest }) => rest);
  }

  async function save(row: PersonQuota) {
    const result = validate(draftFor(row));
    if ('errors' in result) {
      setErrors((all) => ({ ...all, [row.userId]: result.errors }));
      return;
    }
    setSavingId(row.userId);
    try {
      await setQuota.mutateAsync({ userId: row.userId, quota: result.quota });
      discard(row);
      void message.success(`Saved ${row.name}'s quota.`);
    } catch (error) {
      setErrors((all) => ({ ...all, [row.userId]: serverErrors(error) }));
    } finally {
      setSavingId(null);
    }
  }

  const input = (row: PersonQuota, key: keyof Draft, label: string, suffix: ReactNode, width: number, invalid: boolean) => (
    <Input
      size="small"
      inputMode="decimal"
      value={draftFor(row)[key]}
      onChange={(event) => edit(row, { [key]: event.target.value })}
      onPressEnter={() => void save(row)}
      suffix={<span className="unit-suffix">{suffix}</span>}
      status={invalid ? 'error' : undefined}
      aria-label={`${label} for ${row.name}`}
      aria-invalid={invalid}
      style={{ width }}
    />
  );

  const columns: TableColumnsType<PersonQuota> = [
    {
      title: 'Person',
      key: 'person',
      render: (_, row) => (
        <>
          <div className="strong-text">{row.name}</div>
          <div className="table-sub quota-person__meta">
            <RoleTag role={row.role} />
            {row.disabled ? <StatusTag tone="idle" label="Disabled" /> : null}
          </div>
        </>
      ),
    },
    {
      title: 'Slots',
      key: 'slots',
      width: 104,
      render: (_, row) => (
        <div className="quota-cell">
          {input(row, 'slots', 'Slots', 'slots', 88, Boolean(errors[row.userId]?.slots))}
          <div className="table-sub" data-testid="slots-in-use">
            {row.slotsInUse} of {row.slots} in use
          </div>
          <FieldError message={errors[row.userId]?.slots} />
        </div>
      ),
    },
    {
      title: 'CPU-hours a month · used',
      key: 'cpuHoursPerMonth',
      width: 214,
      render: (_, row) => (
        <div className="quota-cell">
          {input(row, 'cpuHoursPerMonth', 'CPU-hours per month', 'CPU-h', 120, Boolean(errors[row.userId]?.cpuHoursPerMonth))}
          <UsageMeter used={row.cpuHoursUsed} allowance={row.cpuHoursPerMonth} compact />
          <FieldError message={errors[row.userId]?.cpuHoursPerMonth} />
        </div>
      ),
    },
    {
      title: 'Largest grid',
      key: 'maxGridPoints',
      width: 124,
      render: (_, row) => (
        <div className="quota-cell">
          {input(row, 'maxGridPoints', 'Largest grid', 'points', 110, Boolean(errors[row.userId]?.maxGridPoints))}
          <FieldError message={errors[row.userId]?.maxGridPoints} />
        </div>
      ),
    },
    {
      title: 'Longest run (CPU time)',
      key: 'maxRunCpuSeconds',
      width: 160,
      render: (_, row) => {
        const invalid = Boolean(errors[row.userId]?.maxRunCpuSeconds);
        return (
          <div className="quota-cell">
            <div className="quota-time">
              {input(row, 'runHours', 'Longest run hours', 'h', 70, invalid)}
              {input(row, 'runMinutes', 'Longest run minutes', 'min', 72, invalid)}
            </div>
            <FieldError message={errors[row.userId]?.maxRunCpuSeconds} />
          </div>
        );
      },
    },
    {
      title: 'Quota',
      key: 'source',
      width: 118,
      render: (_, row) => <DefaultOrCustom row={row} />,
    },
    {
      title: <span className="visually-hidden">Save</span>,
      key: 'save',
      width: 76,
      align: 'right',
      render: (_, row) => {
        const changed = !sameDraft(draftFor(row), draftOf(row));
        return (
          <div className="quota-actions">
            <Button
              size="small"
              type={changed ? 'primary' : 'default'}
              disabled={!changed}
              loading={savingId === row.userId}
              onClick={() => void save(row)}
              aria-label={`Save quota of ${row.name}`}
            >
              Save
            </Button>
            {changed ? (
              <Button size="small" type="link" onClick={() => discard(row)} aria-label={`Undo changes to ${row.name}'s quota`}>
                Undo
              </Button>
            ) : null}
            <FieldError message={errors[row.userId]?.row} />
          </div>
        );
      },
    },
  ];

  const unsaved = quotas.data?.filter((row) => drafts[row.userId] && !sameDraft(drafts[row.userId]!, draftOf(row))).length ?? 0;
  const meta = quotas.data
    ? `${plural(quotas.data.length, 'person', 'people')}, ${quotas.data.filter((q) => q.custom).length} with a custom quota${unsaved ? ` · ${unsaved} unsaved` : ''}`
    : null;

  return (
    <Card title="Quotas" className="panel" extra={meta ? <span className="panel__meta">{meta}</span> : null}>
      {quotas.isPending ? (
        <Skeleton active title={false} paragraph={{ rows: 5 }} />
      ) : quotas.isError ? (
        <QueryError what="the lab's quotas" error={quotas.error} onRetry={() => void quotas.refetch()} />
      ) : (
        <Table<PersonQuota>
          rowKey="userId"
          size="small"
          className="quota-table"
          columns={columns}
          dataSource={quotas.data}
          rowClassName={(row) => (row.disabled ? 'row--disabled' : '')}
          pagination={quotas.data.length > 50 ? { pageSize: 50, showSizeChanger: false } : false}
          locale={{ emptyText: 'No one has an account yet, so there is no quota to set.' }}
        />
      )}
      <p className="panel__note">
        A slot is one CPU core's worth of worker capacity. Runs beyond a person's slots wait in the queue; when their month's
        CPU-hours are used up, running runs are checkpointed and paused until the next month or a higher allowance. Grid and
        CPU-time limits apply to runs submitted after the change. Save (or Enter in a field) stores one row; every change is written to
        the audit log.
      </p>
    </Card>
  );
}
