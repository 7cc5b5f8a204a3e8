import { parseInitialProfileCsv, parseTargetProfileCsv, UPLOAD_KINDS, UPLOAD_LIMITS, type CsvProblem, type UploadInfo, type UploadKind } from '@kiln/shared';
import { Alert, App, Button, Card, Progress, Select, Skeleton, Table, Typography, type TableColumnsType } from 'antd';
import { useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { QueryError } from '@/components/query-error';
import { paths } from '@/config/paths';
import { ApiRequestError } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { formatBytes, formatDateTime, formatNumber, shortId } from '@/lib/format';
import { useCreateUpload } from '../api/create-upload';
import { useUploads } from '../api/get-uploads';
import { useImportCheckpoint } from '../api/import-checkpoint';

export const uploadKindLabel: Record<UploadKind, string> = {
  'initial-profile': 'Initial profile (CSV r,h)',
  'target-profile': 'Target profile (CSV h,f,z)',
  checkpoint: 'Checkpoint file',
};

/** The same checks the API makes, run in the browser before anything is sent. */
async function precheck(kind: UploadKind, file: File): Promise<CsvProblem[]> {
  const limit = kind === 'checkpoint' ? UPLOAD_LIMITS.checkpointBytes : UPLOAD_LIMITS.csvBytes;
  if (file.size > limit) return [{ row: 0, column: '', message: `the file has ${formatBytes(file.size)}; at most ${formatBytes(limit)} are allowed` }];
  if (kind === 'checkpoint') return [];
  const text = await file.text();
  const result = kind === 'initial-profile' ? parseInitialProfileCsv(text) : parseTargetProfileCsv(text);
  return result.ok ? [] : result.problems;
}

const where = (p: CsvProblem) => (p.row === 0 ? 'file' : `row ${p.row}${p.column ? `, column ${p.column}` : ''}`);

function Problems({ title, problems }: { title: string; problems: { where: string; message: string }[] }) {
  return (
    <Alert
      type="error"
      showIcon
      role="alert"
      title={title}
      description={
        <ul className="upload-problems" data-testid="upload-problems">
          {problems.slice(0, 12).map((p, i) => (
            <li key={i}>
              <strong>{p.where}</strong>: {p.message}
            </li>
          ))}
          {problems.length > 12 ? <li>… and {problems.length - 12} more</li> : null}
        </ul>
      }
    />
  );
}

function summaryText(upload: UploadInfo): string {
  const s = upload.summary as Record<string, unknown>;
  const parts: string[] = [];
  if (typeof s.rows === 'number') parts.push(`${s.rows} rows`);
  if (typeof s.domain === 'string') parts.push(`${s.domain}`);
  if (typeof s.t === 'number') parts.push(`t = ${formatNumber(s.t, 5)}`);
  if (typeof s.step === 'number') parts.push(`step ${s.step}`);
  return parts.join(' · ');
}

function ImportCheckpoint({ upload, studies }: { upload: UploadInfo; studies: { id: string; name: string }[] }) {
  const [studyId, setStudyId] = useState<string | undefined>(studies.length === 1 ? studies[0]!.id : undefined);
  const run = useImportCheckpoint();
  if (studies.length === 0) return <span className="muted">Resuming needs a study where you are owner or member.</span>;
  if (run.data) {
    return (
      <span>
        Resumed as run{' '}
        <Link to={paths.run.getHref(run.data.id)} className="mono-link">
          {shortId(run.data.id)}
        </Link>
      </span>
    );
  }
  return (
    <span className="upload-form" style={{ margin: 0 }}>
      <Select<string>
        size="small"
        aria-label={`Study to resume ${upload.filename} in`}
        placeholder="Resume in study…"
        value={studyId}
        onChange={setStudyId}
        style={{ width: 220 }}
        options={studies.map((s) => ({ value: s.id, label: s.name }))}
      />
      <Button size="small" disabled={!studyId} loading={run.isPending} onClick={() => studyId && run.mutate({ uploadId: upload.id, studyId })}>
        Resume this checkpoint
      </Button>
      {run.error ? <span className="status-tag status-tag--down">{describeError(run.error).problem}</span> : null}
    </span>
  );
}

/**
 * Profiles and checkpoints brought from elsewhere: checked in the browser with
 * the API's own parser, uploaded with progress, listed, and a checkpoint resumed
 * as a new run in one of the person's studies.
 */
export function UploadsPanel({ workStudies }: { workStudies: { id: string; name: string }[] }) {
  const uploads = useUploads();
  const create = useCreateUpload();
  const { message } = App.useApp();
  const fileInput = useRef<HTMLInputElement>(null);
  const [kind, setKind] = useState<UploadKind>('initial-profile');
  const [file, setFile] = useState<File | null>(null);
  const [problems, setProblems] = useState<CsvProblem[]>([]);
  const [progress, setProgress] = useState<number | null>(null);

  const check = async (nextKind: UploadKind, nextFile: File | null) => {
    create.reset();
    setProblems(nextFile ? await precheck(nextKind, nextFile) : []);
  };

  const upload = async () => {
    if (!file || problems.length > 0) return;
    setProgress(0);
    try {
      const info = await create.mutateAsync({ kind, file, onProgress: setProgress });
      void message.success(`${info.filename} uploaded and checked${summaryText(info) ? `: ${summaryText(info)}` : ''}.`);
      setFile(null);
      if (fileInput.current) fileInput.current.value = '';
    } catch {
      // Shown below.
    } finally {
      setProgress(null);
    }
  };

  const serverError = create.error;
  const columns: TableColumnsType<UploadInfo> = [
    { title: 'File', key: 'file', render: (_, u) => <span className="mono">{u.filename}</span> },
    { title: 'Kind', key: 'kind', render: (_, u) => uploadKindLabel[u.kind] },
    { title: 'SHA-256', key: 'sha', render: (_, u) => <span className="mono" title={u.sha256}>{u.sha256.slice(0, 12)}…</span> },
    { title: 'Size', key: 'size', className: 'numeric-cell', render: (_, u) => formatBytes(u.sizeBytes) },
    { title: 'Uploaded', key: 'created', render: (_, u) => formatDateTime(u.createdAt) },
    {
      title: '',
      key: 'use',
      render: (_, u) =>
        u.kind === 'checkpoint' ? (
          <ImportCheckpoint upload={u} studies={workStudies} />
        ) : (
          <span className="muted">
            use as <span className="mono">{u.kind === 'initial-profile' ? 'initial.kind = table' : 'target.kind = profile'}</span>, upload id{' '}
            <Typography.Text className="mono" copyable={{ text: u.id, tooltips: ['Copy the upload id', 'Copied'] }}>
              {shortId(u.id)}
            </Typography.Text>
          </span>
        ),
    },
  ];

  return (
    <Card title="Uploads" className="panel" size="small" extra={<span className="panel__meta">profiles and checkpoints from elsewhere</span>}>
      <div className="upload-form">
        <Select<UploadKind>
          aria-label="Kind of upload"
          value={kind}
          style={{ width: 240 }}
          onChange={(next) => {
            setKind(next);
            void check(next, file);
          }}
          options={UPLOAD_KINDS.map((k) => ({ value: k, label: uploadKindLabel[k] }))}
        />
        <input
          ref={fileInput}
          type="file"
          aria-label="File to upload"
          accept={kind === 'checkpoint' ? undefined : '.csv,text/csv'}
          onChange={(event) => {
            const next = event.target.files?.[0] ?? null;
            setFile(next);
            void check(kind, next);
          }}
        />
        <Button type="primary" disabled={!file || problems.length > 0} loading={create.isPending} onClick={() => void upload()}>
          Upload
        </Button>
        {progress !== null ? <Progress percent={Math.round(progress * 100)} size="small" style={{ width: 160 }} aria-label="Upload progress" /> : null}
      </div>
      {problems.length > 0 ? (
        <Problems title={`${file?.name ?? 'The file'} cannot be used as it is; nothing was sent.`} problems={problems.map((p) => ({ where: where(p), message: p.message }))} />
      ) : null}
      {serverError ? (
        serverError instanceof ApiRequestError && serverError.status === 400 && serverError.details.length > 0 ? (
          <Problems title={`Kiln refused ${file?.name ?? 'the file'}: ${serverError.message}`} problems={serverError.details.map((d) => ({ where: d.path || 'file', message: d.message }))} />
        ) : (
          <Alert type="error" showIcon role="alert" title={describeError(serverError).problem} description={describeError(serverError).remedy} />
        )
      ) : null}
      <p className="panel__note">
        Initial profiles need columns r,h from r = 0 to π (sphere) or 1 (ball) with h(0) = 0; target profiles columns h,f,z. Checkpoint files are
        Kiln&apos;s own format, as downloaded from a run page.
      </p>
      {uploads.isPending ? (
        <Skeleton active paragraph={{ rows: 2 }} />
      ) : uploads.isError ? (
        <QueryError what="your uploads" error={uploads.error} onRetry={() => void uploads.refetch()} />
      ) : (
        <Table<UploadInfo>
          rowKey="id"
          size="small"
          className="uploads-table"
          columns={columns}
          dataSource={uploads.data}
          pagination={false}
          locale={{ emptyText: 'Nothing uploaded yet. Choose a kind and a file above.' }}
        />
      )}
    </Card>
  );
}
