import './uploads.css';
import { App, Button, Card, Select } from 'antd';
import { useState } from 'react';
import { IconDownload } from '@/components/icons';
import { downloadFile } from '@/lib/api-client';
import { describeError } from '@/lib/describe-error';
import { formatNumber, shortId } from '@/lib/format';

interface CheckpointRef {
  id: string;
  seq: number;
  t: number;
}

/**
 * Data for analysis elsewhere: the run's metrics as CSV, and a checkpoint's
 * profile as CSV or NumPy .npy, or the checkpoint file itself. Downloads go
 * through fetch with the bearer token; a plain link could not carry it.
 */
export function RunExports({ runId, checkpoints }: { runId: string; checkpoints: CheckpointRef[] }) {
  const { message } = App.useApp();
  const [busy, setBusy] = useState<string | null>(null);
  const newest = checkpoints.reduce<CheckpointRef | null>((a, c) => (!a || c.seq > a.seq ? c : a), null);
  const [chosen, setChosen] = useState<string | undefined>(undefined);
  const checkpoint = checkpoints.find((c) => c.id === chosen) ?? newest;
  const base = `kiln-run-${shortId(runId)}`;

  const get = (key: string, path: string, filename: string) => {
    setBusy(key);
    downloadFile(path, filename)
      .catch((e) => void message.error(`${describeError(e).problem} ${describeError(e).remedy}`))
      .finally(() => setBusy(null));
  };

  return (
    <Card title="Export" className="panel" size="small" extra={<span className="panel__meta">for your own analysis</span>}>
      <div className="run-exports">
        <Button size="small" icon={<IconDownload />} loading={busy === 'metrics'} onClick={() => get('metrics', `/runs/${runId}/metrics.csv`, `${base}-metrics.csv`)}>
          Metrics (CSV)
        </Button>
        {checkpoint ? (
          <>
            <Select<string>
              size="small"
              aria-label="Checkpoint to export"
              value={checkpoint.id}
              onChange={setChosen}
              style={{ width: '100%' }}
              options={[...checkpoints].reverse().map((c) => ({ value: c.id, label: `Checkpoint #${c.seq}, t = ${formatNumber(c.t, 5)}` }))}
            />
            <div className="run-exports__row">
              <Button size="small" icon={<IconDownload />} loading={busy === 'csv'} onClick={() => get('csv', `/checkpoints/${checkpoint.id}/profile.csv`, `${base}-profile-${checkpoint.seq}.csv`)}>
                Profile (CSV)
              </Button>
              <Button size="small" icon={<IconDownload />} loading={busy === 'npy'} onClick={() => get('npy', `/checkpoints/${checkpoint.id}/profile.npy`, `${base}-profile-${checkpoint.seq}.npy`)}>
                Profile (.npy)
              </Button>
              <Button size="small" icon={<IconDownload />} loading={busy === 'file'} onClick={() => get('file', `/checkpoints/${checkpoint.id}/file`, `${base}-checkpoint-${checkpoint.seq}.kcp`)}>
                Checkpoint file
              </Button>
            </div>
          </>
        ) : (
          <p className="muted">Profiles and checkpoint files can be exported once the run has written its first checkpoint.</p>
        )}
      </div>
    </Card>
  );
}
