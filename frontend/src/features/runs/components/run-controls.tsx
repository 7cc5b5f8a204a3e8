import type { Run } from '@kiln/shared';
import { App, Button, Popconfirm, Space } from 'antd';
import { IconPaused, IconRunning, IconStop } from '@/components/icons';
import { describeError } from '@/lib/describe-error';
import { useControlRun, type RunControl } from '../api/control-run';

/** Pause, resume and cancel, offered by the run's state (the API answers 409 otherwise). */
export function RunControls({ run, canWork }: { run: Run; canWork: boolean }) {
  const { message } = App.useApp();
  const control = useControlRun(run.id);
  if (!canWork) return null;
  const s = run.state;
  const canPause = (s === 'running' || s === 'queued' || s === 'waiting') && run.controlRequest === null;
  const canCancel = (s === 'running' || s === 'queued' || s === 'waiting' || s === 'paused') && run.controlRequest !== 'cancel';
  const canResume = s === 'paused' || s === 'cancelled' || s === 'failed' || (s === 'finished' && run.outcome === 'time-limit');
  const act = (action: RunControl, done: string) =>
    control.mutate(action, {
      onSuccess: () => void message.success(done),
      onError: (e) => void message.error(`${describeError(e).problem} ${describeError(e).remedy}`),
    });
  const busy = control.isPending ? control.variables : null;
  return (
    <Space>
      {run.controlRequest ? <span className="muted">{run.controlRequest === 'pause' ? 'Pausing at the next checkpoint…' : 'Cancelling at the next checkpoint…'}</span> : null}
      {canPause ? (
        <Button icon={<IconPaused />} loading={busy === 'pause'} onClick={() => act('pause', 'Pause requested: the worker checkpoints and frees the slot.')}>
          Pause
        </Button>
      ) : null}
      {canResume ? (
        <Button type="primary" icon={<IconRunning />} loading={busy === 'resume'} onClick={() => act('resume', 'Resumed: the run is back in the queue.')}>
          Resume
        </Button>
      ) : null}
      {canCancel ? (
        <Popconfirm
          title="Cancel this run?"
          description="The worker checkpoints and stops; you can still resume or fork from its checkpoints."
          okText="Cancel the run"
          cancelText="Keep it"
          onConfirm={() => act('cancel', 'Cancel requested.')}
        >
          <Button danger icon={<IconStop />} loading={busy === 'cancel'}>
            Cancel run
          </Button>
        </Popconfirm>
      ) : null}
    </Space>
  );
}
