import type { CheckpointInfo, DilationProfileView, Run } from '@kiln/shared';
import type { UseQueryResult } from '@tanstack/react-query';
import { Alert, Button, Card, Form, Input, Modal, Select, Skeleton } from 'antd';
import { useId, useMemo, useRef, useState } from 'react';
import { Chart } from '@/components/chart';
import { IconFork } from '@/components/icons';
import { QueryError } from '@/components/query-error';
import { StatusTag } from '@/components/status-tag';
import { palette } from '@/config/palette';
import { describeError } from '@/lib/describe-error';
import { formatForInput, formatNumber } from '@/lib/format';
import { useDilationProfile } from '../api/get-dilation-profile';
import { useJumpToMaximiser } from '../api/jump-to-maximiser';
import { forcedAxisRange, labelDigits, yBounds } from './axis-range';
import './mobius.css';

/** The F axis spans at least this fraction of |F|: round-off and grid error stay a (nearly) flat line. */
const MIN_RELATIVE_SPAN = 0.05;
/** Below this relative spread F counts as flat, and s* as picked out by round-off and grid error. */
const FLAT_SPREAD = 0.01;

function profileOption(view: DilationProfileView, f1: number) {
  const values = view.profile.map(([, f]) => f);
  const scale = Math.max(...values.map(Math.abs).filter(Number.isFinite), Math.abs(f1), 1e-12);
  const range = forcedAxisRange([...values, f1, view.energyAtMax], MIN_RELATIVE_SPAN * scale);
  const digits = labelDigits(values, range);
  return {
    grid: { left: 72, right: 52, top: 40, bottom: 40 },
    tooltip: {
      trigger: 'axis',
      axisPointer: { type: 'line' },
      formatter: (items: { data: [number, number] }[]) => {
        const point = items[0]?.data;
        return point ? `s = ${formatNumber(point[0], 4)}<br/>F(s) = ${formatNumber(point[1], 6)}` : '';
      },
    },
    xAxis: {
      type: 'log',
      name: 's (log)',
      nameLocation: 'end',
      nameGap: 6,
      axisLabel: { formatter: (v: number) => formatNumber(v, 2) },
    },
    yAxis: {
      type: 'value',
      name: 'F(s)',
      nameTextStyle: { align: 'left' },
      ...yBounds(range),
      axisLabel: { formatter: (v: number) => formatNumber(v, digits), showMinLabel: !range, showMaxLabel: !range },
    },
    series: [
      {
        type: 'line',
        name: 'F(s)',
        data: view.profile,
        showSymbol: view.profile.length <= 80,
        symbolSize: 4,
        lineStyle: { color: palette.info, width: 1.6 },
        itemStyle: { color: palette.info },
        markLine: {
          symbol: 'none',
          silent: true,
          data: [
            { xAxis: view.sStar, lineStyle: { color: palette.ember, type: 'dashed' }, label: { show: false } },
            {
              yAxis: f1,
              lineStyle: { color: palette.inkMuted, type: 'dotted' },
              label: { formatter: `F(1) = ${formatNumber(f1, 5)}`, position: 'insideStartBottom', color: palette.inkMuted },
            },
          ],
        },
      },
      {
        type: 'scatter',
        name: 'marks',
        silent: true,
        symbolSize: 9,
        data: [
          {
            value: [view.sStar, view.energyAtMax],
            itemStyle: { color: palette.ember },
            label: { show: true, formatter: `s* = ${formatNumber(view.sStar, 4)}`, position: 'top', color: palette.ember, fontWeight: 600 },
          },
          { value: [1, f1], itemStyle: { color: palette.inkMuted } },
        ],
        tooltip: { show: false },
      },
    ],
  };
}

const checkpointLabel = (c: CheckpointInfo) => `#${c.seq} · t = ${formatNumber(c.t, 4)} · step ${c.step}`;

/**
 * The Möbius energy profile F(s) = D(h∘γ_s) of a chosen checkpoint (sphere domain),
 * its maximiser s* and the gap F(s*) − F(1), with the experimental jump to s*.
 */
export function DilationProfilePanel({
  run,
  checkpoints,
  canWork,
  onJumped,
}: {
  run: Run;
  checkpoints: UseQueryResult<CheckpointInfo[]>;
  canWork: boolean;
  onJumped: (runId: string) => void;
}) {
  const [chosen, setChosen] = useState<string | null>(null);
  const list = checkpoints.data ?? [];
  const latest = list[list.length - 1];
  // The latest checkpoint until someone picks another. While a run goes on, new checkpoints
  // keep arriving: the profile shown stays until the newest one's profile has been computed.
  const following = !list.some((c) => c.id === chosen);
  const latestProfile = useDilationProfile(following ? latest?.id : undefined);
  const shown = useRef<string | null>(null);
  const previous = list.find((c) => c.id === shown.current);
  const selected = !following
    ? list.find((c) => c.id === chosen)
    : latestProfile.isPending && previous
      ? previous
      : latest;
  shown.current = selected?.id ?? null;
  const catchingUp = following && selected !== latest && !!latest;
  return (
    <Card
      title="Möbius energy profile F(s)"
      className="panel"
      size="small"
      data-testid="dilation-profile-panel"
      extra={
        list.length > 0 ? (
          <Select
            size="small"
            aria-label="Checkpoint for the energy profile"
            value={selected?.id}
            onChange={setChosen}
            style={{ minWidth: 240 }}
            options={[...list].reverse().map((c) => ({ value: c.id, label: checkpointLabel(c) }))}
          />
        ) : null
      }
    >
      <p className="mobius-intro">
        F(s) is the energy of the checkpoint's state moved along its orbit under the dilations γ<sub>s</sub> of S
        <sup>{run.spec.domain.dim}</sup> (tan(γ<sub>s</sub>(r)/2) = s·tan(r/2)); s = 1 is the state itself. Where F peaks, and
        by how much it exceeds F(1), says how far the map sits from the top of its orbit. For m = 2 the energy is conformally
        invariant and F is flat.
      </p>
      {checkpoints.isPending ? (
        <Skeleton active paragraph={{ rows: 4 }} />
      ) : checkpoints.isError ? (
        <QueryError what="the run's checkpoints" error={checkpoints.error} onRetry={() => void checkpoints.refetch()} />
      ) : !selected ? (
        <p className="muted">
          No checkpoints yet: the profile is computed from a saved state. The worker writes one every minute and at pause, cancel
          and the outcome; the latest is picked here as soon as it exists.
        </p>
      ) : (
        <>
          {catchingUp ? (
            <p className="muted" aria-live="polite">
              Computing the profile of the newest checkpoint #{latest!.seq}; showing #{selected.seq} meanwhile.
            </p>
          ) : null}
          <ProfileBody run={run} checkpoint={selected} canWork={canWork} onJumped={onJumped} />
        </>
      )}
    </Card>
  );
}

function ProfileBody({
  run,
  checkpoint,
  canWork,
  onJumped,
}: {
  run: Run;
  checkpoint: CheckpointInfo;
  canWork: boolean;
  onJumped: (runId: string) => void;
}) {
  const profile = useDilationProfile(checkpoint.id);
  const view = profile.data;
  const f1 = view ? view.energyAtMax - view.gap : null;
  const option = useMemo(() => (view && f1 !== null ? profileOption(view, f1) : null), [view, f1]);
  if (profile.isPending) {
    return (
      <div aria-busy="true">
        <p className="muted">Computing F(s) on a log grid of s for checkpoint #{checkpoint.seq}…</p>
        <Skeleton active paragraph={{ rows: 4 }} />
      </div>
    );
  }
  if (profile.isError) {
    return <QueryError what={`the energy profile of checkpoint #${checkpoint.seq}`} error={profile.error} onRetry={() => void profile.refetch()} />;
  }
  const v = profile.data;
  if (v.profile.length === 0 || f1 === null || !option) {
    return <p className="muted">The server returned no samples of F(s) for this checkpoint; try another checkpoint.</p>;
  }
  const values = v.profile.map(([, f]) => f);
  const spread = (Math.max(...values) - Math.min(...values)) / Math.max(Math.abs(f1), 1e-300);
  const sMin = v.profile[0]![0];
  const sMax = v.profile[v.profile.length - 1]![0];
  const atEdge = v.sStar <= sMin * 1.0001 || v.sStar >= sMax / 1.0001;
  const flat = spread < FLAT_SPREAD;
  return (
    <>
      <div className="mobius-profile">
        <figure className="mobius-plots__cell">
          <Chart
            option={option}
            height={260}
            label={`Energy profile F(s) of checkpoint ${checkpoint.seq}, s on a log scale`}
            points={v.profile.length}
          />
          <p className="mobius-plots__note">
            The F axis spans at least {MIN_RELATIVE_SPAN * 100}% of F, so round-off and grid error show as a flat line; the gap
            is given as a number.
          </p>
        </figure>
        <dl className="facts facts--two mobius-numbers" aria-label="Profile numbers">
          <dt>Checkpoint</dt>
          <dd>
            #{checkpoint.seq}, t = {formatNumber(checkpoint.t, 5)}
          </dd>
          <dt>Maximiser s*</dt>
          <dd data-testid="dilation-sstar">{formatNumber(v.sStar, 5)}</dd>
          <dt>F(s*)</dt>
          <dd>{formatNumber(v.energyAtMax, 7)}</dd>
          <dt>F(1)</dt>
          <dd>{formatNumber(f1, 7)}</dd>
          <dt>Gap F(s*) − F(1)</dt>
          <dd data-testid="dilation-gap">
            {formatNumber(v.gap, 4)}
            {Math.abs(v.gap) <= 1e-9 * Math.abs(f1)
              ? ' — at round-off: the state sits at the top of its orbit'
              : Math.abs(f1) > 0
                ? ` (${formatNumber((100 * v.gap) / Math.abs(f1), 3)}% of F(1))`
                : ''}
          </dd>
          <dt>Spread of F</dt>
          <dd>{formatNumber(100 * spread, 3)}% over s ∈ [{formatNumber(sMin, 2)}, {formatNumber(sMax, 2)}]</dd>
        </dl>
      </div>
      {flat ? (
        <Alert
          type="info"
          showIcon
          className="mobius-section"
          title={`F(s) is flat to within ${formatNumber(100 * spread, 2)}% over the searched range`}
          description={`${
            run.spec.domain.dim === 2 ? 'In dimension 2 the Dirichlet energy is conformally invariant, so F is constant in s. ' : ''
          }Where F is this flat, s* and the gap come from round-off and grid error, not from a preferred dilation.`}
        />
      ) : atEdge ? (
        <Alert
          type="info"
          showIcon
          className="mobius-section"
          title="s* sits at the end of the searched range"
          description="F is still rising where the search stops, so the true maximiser may lie further out (as for a map that has already slid toward a pole)."
        />
      ) : null}
      <JumpAction run={run} checkpoint={checkpoint} view={v} f1={f1} canWork={canWork} onJumped={onJumped} />
    </>
  );
}

function JumpAction({
  run,
  checkpoint,
  view,
  f1,
  canWork,
  onJumped,
}: {
  run: Run;
  checkpoint: CheckpointInfo;
  view: DilationProfileView;
  f1: number;
  canWork: boolean;
  onJumped: (runId: string) => void;
}) {
  const [open, setOpen] = useState(false);
  const jump = useJumpToMaximiser();
  const tMaxId = useId();
  // The jump keeps the checkpoint's time t; a parent that ran to t_max would end the new run at once,
  // so then it gets as much time again.
  const suggestedTMax = checkpoint.t >= run.spec.time.tMax * (1 - 1e-12) ? checkpoint.t + run.spec.time.tMax : run.spec.time.tMax;
  const [tMaxText, setTMaxText] = useState(formatForInput(suggestedTMax));
  const tMax = Number(tMaxText.trim());
  const tMaxProblem =
    tMaxText.trim() === '' || !Number.isFinite(tMax)
      ? 'Give the end time as a number.'
      : tMax <= checkpoint.t
        ? `The new run starts at t = ${formatNumber(checkpoint.t, 5)}; t_max must be later.`
        : null;
  const blocked =
    run.spec.flow === 'normalized'
      ? 'Not offered for the normalized flow: it re-centres its initial data, which would undo the jump. Jump from a standard-flow run.'
      : !canWork
        ? 'Only members of the study can start runs; you can look.'
        : null;
  const error = jump.error ? describeError(jump.error) : null;
  return (
    <section className="mobius-jump" aria-label="Experimental: jump to the maximiser">
      <h3 className="mobius-section__title">
        <StatusTag tone="ember" label="Experimental" title="Not a step of any flow; no published method stands behind it" />
        Jump to the maximiser
      </h3>
      <p className="mobius-jump__caution">
        This starts a new standard-flow run from h∘γ<sub>s*</sub>: the checkpoint's state moved along its dilation orbit to
        where F is largest. It is <strong>not a step of any flow</strong>: it adds energy (here F(s*) − F(1) ={' '}
        <span className="mobius-numbers">{formatNumber(view.gap, 4)}</span>), the result depends on the range of s searched and
        on how F is interpolated, and no published method stands behind it. Read what the new run does as an exploration, not as
        evidence about the flow from this run's data.
      </p>
      <Button icon={<IconFork />} disabled={blocked !== null} onClick={() => {
          setTMaxText(formatForInput(suggestedTMax));
          setOpen(true);
        }}
      >
        Experimental: jump to the maximiser…
      </Button>
      {blocked ? <p className="mobius-jump__why">{blocked}</p> : null}
      <Modal
        open={open}
        title={
          <>
            Start an experimental run from h∘γ<sub>s*</sub>?
          </>
        }
        okText="Start the experimental run"
        cancelText="Keep looking"
        okButtonProps={{ loading: jump.isPending, danger: true, disabled: tMaxProblem !== null }}
        onCancel={() => {
          setOpen(false);
          jump.reset();
        }}
        onOk={() =>
          jump.mutate(
            { checkpointId: checkpoint.id, overrides: tMax !== run.spec.time.tMax ? { time: { tMax } } : {} },
            {
              onSuccess: (created) => {
                setOpen(false);
                onJumped(created.id);
              },
            },
          )
        }
        destroyOnHidden
      >
        <div className="mobius-confirm">
          <p>
            A new run, recorded as a fork of checkpoint #{checkpoint.seq} of this run and marked experimental, starts from the
            state dilated by s* on the whole sphere (symmetry “none”), with this run's grid, step sizes and stopping rules. It counts
            against your quota like any run.
          </p>
          <dl className="facts facts--two mobius-numbers">
            <dt>s*</dt>
            <dd>{formatNumber(view.sStar, 5)}</dd>
            <dt>Energy</dt>
            <dd>
              {formatNumber(f1, 6)} → {formatNumber(view.energyAtMax, 6)} (+{formatNumber(view.gap, 4)})
            </dd>
          </dl>
          <Form layout="vertical" component="div">
            <Form.Item
              label="End time t_max of the new run"
              htmlFor={tMaxId}
              validateStatus={tMaxProblem ? 'error' : undefined}
              help={tMaxProblem ?? `It starts at the checkpoint's t = ${formatNumber(checkpoint.t, 5)}.`}
            >
              <Input id={tMaxId} value={tMaxText} onChange={(e) => setTMaxText(e.target.value)} inputMode="decimal" className="mobius-numbers" />
            </Form.Item>
          </Form>
          {error ? <Alert type="error" showIcon className="mobius-section" title={error.problem} description={error.remedy} /> : null}
        </div>
      </Modal>
    </section>
  );
}
