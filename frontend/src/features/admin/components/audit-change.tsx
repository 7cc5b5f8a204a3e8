import { ROLES, type Quota, type Role } from '@kiln/shared';
import { roleLabel } from '@/lib/roles';
import { formatQuotaField, quotaFieldLabel } from './quota-format';

const quotaFields = new Set<string>(['slots', 'cpuHoursPerMonth', 'maxGridPoints', 'maxRunCpuSeconds']);

const fieldLabel = (key: string) =>
  quotaFields.has(key)
    ? quotaFieldLabel[key as keyof Quota]
    : ({ role: 'Role', disabled: 'Access', name: 'Name' } as Record<string, string>)[key] ?? key;

/** One recorded value as a person would say it. */
function formatValue(key: string, value: unknown): string {
  if (value === null || value === undefined) return 'none';
  if (quotaFields.has(key) && typeof value === 'number') return formatQuotaField(key as keyof Quota, value);
  if (key === 'role' && ROLES.includes(value as Role)) return roleLabel[value as Role];
  if (key === 'disabled' && typeof value === 'boolean') return value ? 'Disabled' : 'Active';
  if (typeof value === 'string') return value;
  return JSON.stringify(value);
}

const lowerFirst = (text: string) => text.charAt(0).toLowerCase() + text.slice(1);

const isRecord = (value: unknown): value is Record<string, unknown> =>
  typeof value === 'object' && value !== null && !Array.isArray(value);

/** An audit entry's before and after: the fields that changed as "old → new", the rest named as unchanged. */
export function AuditChange({ before, after }: { before: unknown; after: unknown }) {
  if (!isRecord(before) && !isRecord(after)) {
    if (before === null && after === null) return <span className="muted">no values recorded</span>;
    return (
      <span className="audit-change__pair">
        <span className="audit-change__before">{JSON.stringify(before)}</span>
        <span aria-label="changed to"> → </span>
        <span className="audit-change__after">{JSON.stringify(after)}</span>
      </span>
    );
  }
  const from = isRecord(before) ? before : {};
  const to = isRecord(after) ? after : {};
  const keys = [...new Set([...Object.keys(from), ...Object.keys(to)])];
  const changed = keys.filter((key) => JSON.stringify(from[key]) !== JSON.stringify(to[key]));
  const same = keys.filter((key) => !changed.includes(key));
  return (
    <div className="audit-change">
      {changed.length === 0 ? <div className="muted">Saved with the same values.</div> : null}
      <ul className="audit-change__list">
        {changed.map((key) => (
          <li key={key} data-field={key}>
            <span className="audit-change__field">{fieldLabel(key)}</span>{' '}
            <span className="audit-change__values">
              {isRecord(before) ? <span className="audit-change__before">{formatValue(key, from[key])}</span> : null}
              {isRecord(before) ? <span className="audit-change__arrow" aria-label="changed to"> → </span> : 'set to '}
              <span className="audit-change__after">{formatValue(key, to[key])}</span>
            </span>
          </li>
        ))}
      </ul>
      {same.length ? <div className="audit-change__same">Unchanged: {same.map((key) => lowerFirst(fieldLabel(key))).join(', ')}</div> : null}
    </div>
  );
}
