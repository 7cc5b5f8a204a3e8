import type { CheckpointInfo, RunSpec } from '@kiln/shared';
import { Radio, Skeleton, Slider } from 'antd';
import { useMemo, useState } from 'react';
import { Chart } from '@/components/chart';
import { QueryError } from '@/components/query-error';
import { palette } from '@/config/palette';
import { formatNumber } from '@/lib/format';
import { useCheckpointProfile } from '../api/get-run-checkpoints';

type XScale = 'r' | 'log-r' | 'log-pole';

/**
 * h(r) stored in each checkpoint, one at a time on a slider. Near a pole the
 * profile collapses onto a tiny region, so the x-axis can be log r (the pole r = 0)
 * or log(π − r) (the sphere's other pole).
 */
export function ProfileSnapshots({ checkpoints, spec }: { checkpoints: CheckpointInfo[]; spec: RunSpec }) {
  // Follows the newest checkpoint until the person picks one with the slider.
  const [picked, setPicked] = useState<number | null>(null);
  const index = picked ?? checkpoints.length - 1;
  const setIndex = (i: number) => setPicked(i === checkpoints.length - 1 ? null : i);
  const [scale, setScale] = useState<XScale>('r');
  const checkpoint = checkpoints[Math.max(0, Math.min(index, checkpoints.length - 1))];
  const profile = useCheckpointProfile(checkpoint?.id);
  const sphere = spec.domain.kind === 'sphere';
  const end = sphere ? Math.PI : 1;

  const option = useMemo(() => {
    if (!profile.data) return null;
    const { r, h } = profile.data;
    const data: number[][] = [];
    for (let i = 0; i < r.length; i++) {
      const x = scale === 'r' ? r[i]! : scale === 'log-r' ? r[i]! : end - r[i]!;
      if (scale !== 'r' && !(x > 0)) continue;
      data.push([x, h[i]!]);
    }
    return {
      grid: { left: 60, right: 20, top: 24, bottom: 44 },
      tooltip: { trigger: 'axis', valueFormatter: (v: number) => formatNumber(v, 5) },
      xAxis: {
        type: scale === 'r' ? 'value' : 'log',
        name: scale === 'r' ? 'r' : scale === 'log-r' ? 'r (log, pole r = 0 on the left)' : `${sphere ? 'π' : '1'} − r (log, pole on the left)`,
        nameLocation: 'middle',
        nameGap: 28,
        min: scale === 'r' ? 0 : undefined,
        max: scale === 'r' ? end : undefined,
        axisLabel: { formatter: (v: number) => formatNumber(v, 2) },
      },
      yAxis: {
        type: 'value',
        name: 'h (rad)',
        axisLabel: { formatter: (v: number) => `${formatNumber(v / Math.PI, 2)}π` },
      },
      series: [{ type: 'line', data, showSymbol: data.length < 80, symbolSize: 4, lineStyle: { color: palette.ember, width: 1.8 }, itemStyle: { color: palette.ember } }],
    };
  }, [profile.data, scale, end, sphere]);

  if (checkpoints.length === 0) {
    return <p className="muted">No checkpoints yet. The worker writes one every minute, and at pause, cancel and the outcome.</p>;
  }

  return (
    <div className="profile-snapshots">
      <div className="profile-snapshots__controls">
        <div className="profile-snapshots__slider">
          <span className="inline-label">Checkpoint</span>
          <Slider
            min={0}
            max={Math.max(0, checkpoints.length - 1)}
            value={Math.min(index, checkpoints.length - 1)}
            onChange={setIndex}
            disabled={checkpoints.length < 2}
            tooltip={{ formatter: (i) => (i === undefined ? '' : `#${checkpoints[i]!.seq} · t = ${formatNumber(checkpoints[i]!.t, 4)}`) }}
            aria-label="Checkpoint"
          />
        </div>
        <Radio.Group
          value={scale}
          onChange={(e) => setScale(e.target.value)}
          optionType="button"
          size="small"
          options={[
            { value: 'r', label: 'r' },
            { value: 'log-r', label: 'log r (near r = 0)' },
            ...(sphere ? [{ value: 'log-pole', label: 'log(π − r) (near r = π)' }] : []),
          ]}
        />
      </div>
      <div className="profile-snapshots__caption">
        Checkpoint #{checkpoint!.seq} ({checkpoint!.reason}) · step {checkpoint!.step} · t = {formatNumber(checkpoint!.t, 5)} · {checkpoint!.points} points
      </div>
      {profile.isPending ? (
        <Skeleton active paragraph={{ rows: 4 }} />
      ) : profile.isError ? (
        <QueryError what="the profile stored in this checkpoint" error={profile.error} onRetry={() => void profile.refetch()} />
      ) : option ? (
        <Chart option={option} height={250} label={`Profile h(r) at checkpoint ${checkpoint!.seq}`} points={profile.data.r.length} />
      ) : null}
    </div>
  );
}
