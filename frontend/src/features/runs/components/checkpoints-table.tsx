import type { CheckpointInfo } from '@kiln/shared';
import { App, Button, Popconfirm, Space, Table, type TableColumnsType } from 'antd';
import { IconDownload, IconFork, IconRunning } from '@/components/icons';
import { downloadFile } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { formatBytes, formatCpu, formatDateTime, formatNumber, formatTime, shortId } from '@/lib/format';
import { useResumeFromCheckpoint } from '../api/checkpoint-actions';

const reasonWord: Record<string, string> = {
  interval: 'periodic',
  pause: 'at pause',
  cancel: 'at cancel',
  outcome: 'at the outcome',
  shutdown: 'worker shutdown',
};

/** The run's checkpoints with what each can do: resume here, fork with changes, download. */
export function CheckpointsTable({
  runId,
  checkpoints,
  canWork,
  canResume,
  onFork,
}: {
  runId: string;
  checkpoints: CheckpointInfo[];
  /** Fork and resume need membership of the study (viewers only look). */
  canWork: boolean;
  /** Resuming is possible while the run rests (paused, cancelled, failed, time limit). */
  canResume: boolean;
  onFork: (checkpoint: CheckpointInfo) => void;
}) {
  const { message } = App.useApp();
  const resume = useResumeFromCheckpoint();
  const columns: TableColumnsType<CheckpointInfo> = [
    { title: '#', dataIndex: 'seq', width: 50, className: 'numeric-cell' },
    { title: 'Step', dataIndex: 'step', className: 'numeric-cell' },
    { title: 't', dataIndex: 't', render: (t: number) => formatNumber(t, 5), className: 'numeric-cell' },
    { title: 'Points', dataIndex: 'points', className: 'numeric-cell' },
    { title: 'Written', dataIndex: 'reason', render: (r: string) => reasonWord[r] ?? r },
    { title: 'CPU so far', dataIndex: 'cpuSeconds', render: (s: number) => formatCpu(s), className: 'numeric-cell', responsive: ['xxl'] },
    { title: 'Size', dataIndex: 'sizeBytes', render: (b: number) => formatBytes(b), className: 'numeric-cell', responsive: ['xxl'] },
    { title: 'At', dataIndex: 'createdAt', render: (at: string) => <span title={formatDateTime(at)}>{formatTime(at)}</span>, className: 'numeric-cell' },
    {
      title: '',
      key: 'actions',
      render: (_, cp) => (
        <Space size={4}>
          {canWork ? (
            <Button size="small" icon={<IconFork />} onClick={() => onFork(cp)} aria-label={`Fork from checkpoint ${cp.seq}`}>
              Fork…
            </Button>
          ) : null}
          {canWork && canResume ? (
            <Popconfirm
              title={`Resume this run from checkpoint #${cp.seq}?`}
              description="Samples after this checkpoint's step are replaced by the resumed computation."
              okText="Resume here"
              onConfirm={() =>
                resume.mutate(cp.id, {
                  onSuccess: () => void message.success(`Resuming from checkpoint #${cp.seq}.`),
                  onError: (e) => void message.error(`${describeError(e).problem} ${describeError(e).remedy}`),
                })
              }
            >
              <Button size="small" icon={<IconRunning />}>
                Resume here
              </Button>
            </Popconfirm>
          ) : null}
          <Button
            size="small"
            type="text"
            icon={<IconDownload />}
            aria-label={`Download checkpoint ${cp.seq}`}
            title="Download the checkpoint file (Kiln checkpoint format)"
            onClick={() =>
              void downloadFile(`/checkpoints/${cp.id}/file`, `kiln-run-${shortId(runId)}-checkpoint-${cp.seq}.kcp`).catch((e) =>
                message.error(`${describeError(e).problem} ${describeError(e).remedy}`),
              )
            }
          />
        </Space>
      ),
    },
  ];
  return (
    <Table<CheckpointInfo>
      rowKey="id"
      size="small"
      columns={columns}
      dataSource={[...checkpoints].reverse()}
      scroll={{ x: 'max-content' }}
      pagination={checkpoints.length > 10 ? { pageSize: 10, showSizeChanger: false } : false}
      locale={{ emptyText: 'No checkpoints yet: the worker writes one every minute and at pause, cancel and the outcome.' }}
    />
  );
}
