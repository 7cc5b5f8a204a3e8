import type { FlowSummary, MetricSample, Run } from '@kiln/shared';
import type { UseQueryResult } from '@tanstack/react-query';
import { Card, Skeleton } from 'antd';
import { useMemo } from 'react';
import { Chart } from '@/components/chart';
import { QueryError } from '@/components/query-error';
import { StatusTag } from '@/components/status-tag';
import { palette } from '@/config/palette';
import { formatNumber } from '@/lib/format';
import { forcedAxisRange, labelDigits, yBounds } from './axis-range';
import './mobius.css';

const MAX_PLOTTED = 3_000;

function thin(samples: MetricSample[]): MetricSample[] {
  if (samples.length <= MAX_PLOTTED) return samples;
  const k = Math.ceil(samples.length / MAX_PLOTTED);
  const out = samples.filter((_, i) => i % k === 0);
  if (out[out.length - 1] !== samples[samples.length - 1]) out.push(samples[samples.length - 1]!);
  return out;
}

const finite = (v: number | null | undefined) => (v !== null && v !== undefined && Number.isFinite(v) ? v : null);

function plot(yName: string, name: string, data: [number, number | null][], color: string, range: { min: number; max: number } | null) {
  const digits = labelDigits(data.map(([, v]) => v), range);
  return {
    grid: { left: 72, right: 20, top: 30, bottom: 36 },
    tooltip: { trigger: 'axis', valueFormatter: (v: number) => formatNumber(v, 4), axisPointer: { type: 'line' } },
    xAxis: {
      type: 'value',
      name: 't',
      nameLocation: 'end',
      nameGap: 6,
      scale: true,
      axisLabel: { formatter: (v: number) => formatNumber(v, 3) },
    },
    yAxis: {
      type: 'value',
      name: yName,
      nameTextStyle: { align: 'left' },
      ...yBounds(range),
      axisLabel: { formatter: (v: number) => formatNumber(v, digits), showMinLabel: !range, showMaxLabel: !range },
    },
    series: [
      {
        type: 'line',
        name,
        data,
        showSymbol: false,
        connectNulls: false,
        lineStyle: { color, width: 1.6 },
        itemStyle: { color },
        markLine: { symbol: 'none', silent: true, lineStyle: { color: palette.line, type: 'solid' }, label: { show: false }, data: [{ yAxis: 0 }] },
      },
    ],
  };
}

/** Largest |value| over the series, or null when there is none. */
function largest(values: (number | null)[]): number | null {
  let m: number | null = null;
  for (const v of values) if (v !== null) m = Math.max(m ?? 0, Math.abs(v));
  return m;
}

/**
 * σ(t) and the center X(t) of a sphere-domain run, in words and plots, and for a
 * finished normalized run the re-centring record from its summary (numerics.md §1).
 */
export function MobiusTrajectoryPanel({ run, metrics }: { run: Run; metrics: UseQueryResult<MetricSample[]> }) {
  const normalized = run.spec.flow === 'normalized';
  const summary = run.summary as FlowSummary | null;
  const samples = metrics.data;
  const view = useMemo(() => {
    if (!samples || samples.length === 0) return null;
    const shown = thin(samples);
    const sigma = shown.map((s) => finite(s.sigma));
    const center = shown.map((s) => finite(s.center));
    const energyScale = Math.max(...shown.map((s) => Math.abs(s.energy)).filter(Number.isFinite), 1);
    // Minimum spans: X is an energy-weighted integral, so 1e-6 of the energy is far above
    // round-off; σ is a rate, and 1e-6 is far above the round-off of a centred run.
    const sigmaRange = forcedAxisRange(sigma, 1e-6);
    const centerRange = forcedAxisRange(center, 1e-6 * energyScale);
    return {
      count: shown.length,
      sigmaLast: [...sigma].reverse().find((v) => v !== null) ?? null,
      centerLast: [...center].reverse().find((v) => v !== null) ?? null,
      centerFirst: center.find((v) => v !== null) ?? null,
      sigmaMax: largest(sigma),
      centerMax: largest(center),
      hasSigma: sigma.some((v) => v !== null),
      hasCenter: center.some((v) => v !== null),
      sigmaOption: plot('σ', 'σ(t)', shown.map((s, i) => [s.t, sigma[i]!]), palette.ember, sigmaRange),
      centerOption: plot('X', 'center X(t)', shown.map((s, i) => [s.t, center[i]!]), palette.info, centerRange),
    };
  }, [samples]);

  return (
    <Card
      title="Dilation direction: σ(t) and center X(t)"
      className="panel"
      size="small"
      extra={
        normalized ? (
          <StatusTag tone="info" label="Normalized flow" title="h_t = τ + σ(t)·sin r·h_r, with σ keeping X at zero" />
        ) : (
          <StatusTag tone="idle" label="Standard flow" title="h_t = τ; σ is 0 and X is free to drift" />
        )
      }
    >
      <p className="mobius-intro">
        <strong>X</strong> is the energy-weighted center of the map along the symmetry axis (∫ cos r · e): it is 0 for a map
        symmetric under r ↦ π − r. <strong>σ</strong> is the speed along the dilation direction sin r·∂<sub>r</sub> that the
        normalized flow adds to keep X at zero.{' '}
        {normalized
          ? 'In this normalized run X should stay at round-off; σ records how hard the flow had to push.'
          : 'This is a standard-flow run: σ is 0 throughout and X is free to drift — a drift away from 0 means the map is sliding toward a pole.'}
      </p>
      {metrics.isPending ? (
        <Skeleton active paragraph={{ rows: 4 }} />
      ) : metrics.isError ? (
        <QueryError what="the run's diagnostics" error={metrics.error} onRetry={() => void metrics.refetch()} />
      ) : !view ? (
        <p className="muted">No samples yet: σ and X appear as soon as a worker picks the run up.</p>
      ) : (
        <>
          <div className="mobius-plots" data-testid="mobius-trajectory">
            <figure className="mobius-plots__cell">
              <figcaption>σ(t): speed along the dilation direction</figcaption>
              {view.hasSigma ? (
                <Chart option={view.sigmaOption} height={200} label="Sigma over time" points={view.count} />
              ) : (
                <p className="muted">This run recorded no σ.</p>
              )}
              <p className="mobius-plots__note mobius-numbers">
                latest σ = {formatNumber(view.sigmaLast, 4)} · largest |σ| = {formatNumber(view.sigmaMax, 3)}
              </p>
            </figure>
            <figure className="mobius-plots__cell">
              <figcaption>X(t): energy-weighted center</figcaption>
              {view.hasCenter ? (
                <Chart option={view.centerOption} height={200} label="Center X over time" points={view.count} />
              ) : (
                <p className="muted">This run recorded no center.</p>
              )}
              <p className="mobius-plots__note mobius-numbers">
                X: {formatNumber(view.centerFirst, 4)} at the first sample → {formatNumber(view.centerLast, 4)} latest (change{' '}
                {view.centerFirst !== null && view.centerLast !== null ? formatNumber(view.centerLast - view.centerFirst, 3) : '—'}) · largest
                |X| = {formatNumber(view.centerMax, 3)}
              </p>
            </figure>
          </div>
          <p className="mobius-plots__note">
            Both y-axes span at least 10⁻⁶ (X: relative to the energy), so values at round-off show as a flat line at 0.
          </p>
        </>
      )}
      {normalized ? <RecentreRecord run={run} summary={summary} /> : null}
    </Card>
  );
}

function RecentreRecord({ run, summary }: { run: Run; summary: FlowSummary | null }) {
  const recentre = summary?.recentre;
  return (
    <section className="mobius-section" aria-label="Re-centring of the initial data" data-testid="recentre-record">
      <h3 className="mobius-section__title">Re-centring of the initial data</h3>
      {run.state !== 'finished' || !summary ? (
        <p className="muted">
          The record (the dilation s that made X = 0, X and the energy before and after, σ at t = 0) appears here when the run
          finishes.
        </p>
      ) : !recentre ? (
        <p className="muted">This run's summary has no re-centring record (it was written before Kiln kept one).</p>
      ) : (
        <>
          <p className="mobius-intro">
            The normalized flow needs X = 0 at the start, so h₀ was replaced by h₀∘γ<sub>s</sub> for the s below
            {recentre.s === 1 ? ' (s = 1: the data was already centred)' : ''}.
          </p>
          <dl className="facts facts--two mobius-numbers">
            <dt>Dilation s</dt>
            <dd data-testid="recentre-s">{formatNumber(recentre.s, 6)}</dd>
            <dt>X before</dt>
            <dd>{formatNumber(recentre.centerBefore, 4)}</dd>
            <dt>Energy before → after</dt>
            <dd>
              {formatNumber(recentre.energyBefore, 6)} → {formatNumber(recentre.energyAfter, 6)}
            </dd>
            <dt>σ(0)</dt>
            <dd>{formatNumber(summary.sigmaInitial ?? null, 4)}</dd>
          </dl>
        </>
      )}
    </section>
  );
}
