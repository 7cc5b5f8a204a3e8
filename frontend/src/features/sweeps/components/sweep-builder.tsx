import { createSweepRequestSchema, expandSweep, safeParseRunSpec, sweepRunCount, type SweepPreviewRequest, type UploadInfo } from '@kiln/shared';
import { Alert, Button, Card, Form, Input } from 'antd';
import { useDeferredValue, useEffect, useMemo, useState } from 'react';
import { ApiRequestError } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { useUploads } from '@/features/uploads/api/get-uploads';
import { useCreateSweep } from '../api/create-sweep';
import { useSweepPreview } from '../api/preview-sweep';
import { AxesEditor, newAxisDraft } from './axes-editor';
import { InitialProfileChart } from './initial-profile-chart';
import { SpecForm } from './spec-form';
import {
  DEFAULT_SPEC_DRAFT,
  initialProfileUploads,
  toSpecInput,
  uploadRows,
  validateAxes,
  validateSpecDraft,
  type AxisDraft,
  type SpecDraft,
} from './spec-draft';
import { SweepPreviewPanel } from './sweep-preview-panel';

function useDebounced<T>(value: T, ms: number): T {
  const [debounced, setDebounced] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setDebounced(value), ms);
    return () => clearTimeout(timer);
  }, [value, ms]);
  return debounced;
}

/** In place of the h₀ plot when the initial data is an uploaded table. */
function UploadedTableNote({ upload }: { upload: UploadInfo | null }) {
  if (!upload) return <div className="chart-empty">Choose one of your uploaded initial profiles to use its table as h₀.</div>;
  const rows = uploadRows(upload);
  return (
    <div className="chart-empty" data-testid="initial-table-note">
      h₀ from your table{rows !== null ? ` (${rows} rows)` : ''}: {upload.filename}. Kiln interpolates it onto the grid when the run starts.
    </div>
  );
}

/**
 * The sweep builder: base spec, axes, a live preview against the quota and h₀(r).
 * Everything is checked in the browser by the same shared schemas the API uses,
 * so the messages are the API's; the API checks again on submit.
 */
export function SweepBuilder({ studyId, onCreated }: { studyId: string; onCreated: (sweepId: string) => void }) {
  const [draft, setDraft] = useState<SpecDraft>(DEFAULT_SPEC_DRAFT);
  const [axes, setAxes] = useState<AxisDraft[]>(() => [{ ...newAxisDraft('target.axisRatio'), valuesText: '1.5, 2, 2.5, 3' }]);
  const [name, setName] = useState('');
  const [nameTouched, setNameTouched] = useState(false);
  const create = useCreateSweep();
  const uploads = useUploads();

  const specErrors = useMemo(() => validateSpecDraft(draft, uploads.data), [draft, uploads.data]);
  const axesCheck = useMemo(() => validateAxes(axes), [axes]);
  const base = useMemo(() => toSpecInput(draft), [draft]);
  const specValid = Object.keys(specErrors).length === 0;

  // Every run of the sweep through the run-spec schema (e.g. an axis value outside a field's range).
  const deferredBase = useDeferredValue(base);
  const expansion = useMemo(
    () => (specValid && axesCheck.axes ? expandSweep(deferredBase, axesCheck.axes) : null),
    [specValid, axesCheck.axes, deferredBase],
  );
  const nameError = (() => {
    const parsed = createSweepRequestSchema.shape.name.safeParse(name);
    return parsed.success ? null : parsed.error.issues[0]!.message;
  })();

  const blocked = !specValid
    ? `Base spec: ${Object.entries(specErrors).map(([p, m]) => (m.startsWith(p) ? m : `${p}: ${m}`))[0]}`
    : !axesCheck.axes
      ? 'Fix the axes first.'
      : expansion && !expansion.ok
        ? expansion.message
        : null;

  const previewBody: SweepPreviewRequest | null = blocked || !axesCheck.axes ? null : { studyId, base, axes: axesCheck.axes, priority: 0 };
  const debouncedBody = useDebounced(previewBody, 400);
  const preview = useSweepPreview(debouncedBody);
  const localRunCount = axesCheck.axes ? sweepRunCount(axesCheck.axes) : null;

  // h₀ needs only the domain and the initial data: the rest of the spec may still be being typed.
  const profileSpec = useMemo(() => {
    const parsed = safeParseRunSpec({ ...base, grid: { points: 100 }, time: { tMax: 1 }, stop: {} });
    return parsed.success ? parsed.spec : null;
  }, [base]);

  // An uploaded table is not sent back by the API, so there is nothing to draw: say which table it is.
  const initialTable =
    draft.initialKind === 'table' && uploads.data
      ? initialProfileUploads(uploads.data, draft.domainKind).find((u) => u.id === draft.initialUploadId) ?? null
      : null;

  const serverError = create.error ? describeError(create.error) : null;
  const serverDetails = create.error instanceof ApiRequestError ? create.error.details : [];

  const submit = () => {
    setNameTouched(true);
    if (blocked || nameError || !axesCheck.axes) return;
    create.mutate(
      { studyId, name: name.trim(), base, axes: axesCheck.axes, priority: 0 },
      { onSuccess: (sweep) => onCreated(sweep.id) },
    );
  };

  return (
    <div className="page__grid builder">
      <div className="page__main">
        <Card className="panel" size="small" title="Sweep">
          <Form layout="vertical" component="div" requiredMark={false}>
            <Form.Item
              label="Name"
              htmlFor="sweep-name"
              validateStatus={nameTouched && nameError ? 'error' : undefined}
              help={nameTouched && nameError ? nameError : undefined}
              extra={nameTouched && nameError ? undefined : 'How the sweep appears in the study, e.g. "axis ratio past 2√2, coarse".'}
            >
              <Input
                id="sweep-name"
                value={name}
                onChange={(e) => setName(e.target.value)}
                onBlur={() => setNameTouched(true)}
                maxLength={240}
              />
            </Form.Item>
          </Form>
        </Card>
        <SpecForm
          draft={draft}
          onChange={(patch) => setDraft((d) => ({ ...d, ...patch }))}
          errors={specErrors}
          uploads={uploads.data}
          uploadsError={uploads.error}
        />
        <AxesEditor axes={axes} onChange={setAxes} errors={axesCheck.errors} general={axesCheck.general} />
      </div>
      <aside className="page__side builder__side">
        <SweepPreviewPanel
          localRunCount={localRunCount}
          preview={debouncedBody ? preview.data : undefined}
          pending={preview.isFetching}
          error={preview.error}
          blocked={blocked}
        />
        <Card title="Initial profile h₀(r)" className="panel" size="small">
          {draft.initialKind === 'table' ? (
            <UploadedTableNote upload={initialTable} />
          ) : (
            <InitialProfileChart spec={profileSpec} />
          )}
        </Card>
        {serverError ? (
          <Alert
            type="error"
            showIcon
            title="Kiln did not create the sweep"
            description={
              <>
                <div>{serverError.problem}</div>
                {serverDetails.slice(0, 4).map((d, i) => (
                  <div key={i}>
                    {d.path}: {d.message}
                  </div>
                ))}
                <div>{serverError.remedy}</div>
              </>
            }
          />
        ) : null}
        <Button
          type="primary"
          size="large"
          block
          onClick={submit}
          loading={create.isPending}
          disabled={!!blocked}
        >
          {localRunCount !== null && !blocked ? `Submit ${localRunCount} run${localRunCount === 1 ? '' : 's'}` : 'Submit sweep'}
        </Button>
        <p className="muted builder__after">
          Runs join the queue at once and start as your slots allow; you can pause or cancel any of them later.
        </p>
      </aside>
    </div>
  );
}
