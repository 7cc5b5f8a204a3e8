import type { MetricSample, RunSpec } from '@kiln/shared';
import { useMemo } from 'react';
import { Chart } from '@/components/chart';
import { palette } from '@/config/palette';
import { formatNumber } from '@/lib/format';

const MAX_PLOTTED = 3_000;

/** Every k-th sample (the last one always kept), so long runs stay quick to draw. */
function thin(samples: MetricSample[]): MetricSample[] {
  if (samples.length <= MAX_PLOTTED) return samples;
  const k = Math.ceil(samples.length / MAX_PLOTTED);
  const out = samples.filter((_, i) => i % k === 0);
  if (out[out.length - 1] !== samples[samples.length - 1]) out.push(samples[samples.length - 1]!);
  return out;
}

const positive = (v: number) => (Number.isFinite(v) && v > 0 ? v : null);

function baseOption(yName: string, log: boolean) {
  return {
    grid: { left: 64, right: 20, top: 30, bottom: 36 },
    tooltip: {
      trigger: 'axis',
      valueFormatter: (v: number) => formatNumber(v, 4),
      axisPointer: { type: 'line' },
    },
    xAxis: {
      type: 'value',
      name: 't',
      nameLocation: 'end',
      nameGap: 6,
      scale: true,
      axisLabel: { formatter: (v: number) => formatNumber(v, 3) },
    },
    yAxis: {
      type: log ? 'log' : 'value',
      name: yName,
      nameTextStyle: { align: 'left' },
      scale: true,
      axisLabel: { formatter: (v: number) => formatNumber(v, 3) },
    },
  };
}

const line = (name: string, data: (number | null)[][], color: string, extra: object = {}) => ({
  type: 'line',
  name,
  data,
  showSymbol: false,
  connectNulls: false,
  lineStyle: { color, width: 1.6 },
  itemStyle: { color },
  ...extra,
});

/**
 * The run's diagnostics over flow time: energy, tension (log), max|∇u| and λ
 * (log, with the gradient bound and T̂ marked), step size (log).
 */
export function RunMetricsCharts({
  samples,
  spec,
  blowupT,
}: {
  samples: MetricSample[];
  spec: RunSpec;
  blowupT: number | null;
}) {
  const shown = useMemo(() => thin(samples), [samples]);
  const options = useMemo(() => {
    const t = shown.map((s) => s.t);
    const tMark = blowupT !== null
      ? { xAxis: blowupT, label: { formatter: `T̂ ≈ ${formatNumber(blowupT, 4)}`, position: 'insideEndTop' }, lineStyle: { color: palette.ember, type: 'dashed' } }
      : null;
    const energy = {
      ...baseOption('energy D', false),
      series: [line('energy', shown.map((s, i) => [t[i]!, s.energy]), palette.info, tMark ? { markLine: { symbol: 'none', silent: true, data: [tMark] } } : {})],
    };
    const tension = {
      ...baseOption('‖τ‖ (log)', true),
      series: [
        line('tension ‖τ‖', shown.map((s, i) => [t[i]!, positive(s.tension)]), palette.info, {
          markLine: {
            symbol: 'none',
            silent: true,
            lineStyle: { color: palette.ok, type: 'dashed' },
            label: { formatter: 'tension threshold', position: 'insideStartTop', color: palette.ok },
            data: [{ yAxis: spec.stop.tension }],
          },
        }),
      ],
    };
    const gradient = {
      ...baseOption('max|∇u|, λ (log)', true),
      legend: { top: 0, right: 8, itemWidth: 14, textStyle: { fontSize: 12 } },
      series: [
        line('max|∇u|', shown.map((s, i) => [t[i]!, positive(s.gradMax)]), palette.ember, {
          markLine: {
            symbol: 'none',
            silent: true,
            lineStyle: { color: palette.down, type: 'dashed' },
            label: { formatter: `gradient bound ${formatNumber(spec.stop.gradientBound, 2)}`, position: 'insideStartTop', color: palette.down },
            data: [{ yAxis: spec.stop.gradientBound }, ...(tMark ? [tMark] : [])],
          },
        }),
        line('λ', shown.map((s, i) => [t[i]!, positive(s.lambda)]), palette.inkMuted, { lineStyle: { color: palette.inkMuted, width: 1.4, type: 'dotted' } }),
      ],
    };
    const step = {
      ...baseOption('dt (log)', true),
      series: [line('step size dt', shown.map((s, i) => [t[i]!, positive(s.dt)]), '#6b5ca5')],
    };
    return { energy, tension, gradient, step };
  }, [shown, spec, blowupT]);

  return (
    <div className="metric-grid" data-testid="metric-charts" data-samples={samples.length}>
      <figure className="metric-grid__cell">
        <figcaption>Energy</figcaption>
        <Chart option={options.energy} height={210} label="Energy over time" points={shown.length} />
      </figure>
      <figure className="metric-grid__cell">
        <figcaption>Tension norm</figcaption>
        <Chart option={options.tension} height={210} label="Tension norm over time, log scale" points={shown.length} />
      </figure>
      <figure className="metric-grid__cell">
        <figcaption>Gradient and concentration scale — blow-up indicators</figcaption>
        <Chart option={options.gradient} height={210} label="Largest gradient and lambda over time, log scale" points={shown.length} />
      </figure>
      <figure className="metric-grid__cell">
        <figcaption>Step size</figcaption>
        <Chart option={options.step} height={210} label="Step size over time, log scale" points={shown.length} />
      </figure>
    </div>
  );
}
