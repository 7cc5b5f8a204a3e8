import type { CandidatePlots } from '@kiln/shared';
import { useMemo } from 'react';
import { Chart } from '@/components/chart';
import { palette } from '@/config/palette';
import { formatNumber } from '@/lib/format';

const axisLabel = { formatter: (v: number) => formatNumber(v, 3) };
const tooltip = { trigger: 'axis', valueFormatter: (v: number) => formatNumber(v, 4), axisPointer: { type: 'line' } };
const positive = (v: number) => Number.isFinite(v) && v > 0;

/** Older profiles light, the newest in full ember: the eye follows the collapse. */
const PROFILE_RAMP = ['#e9c9b4', '#dfa47f', '#d4834f', '#c96a30', palette.ember];

/**
 * The fitted power law max|∇u| ≈ C (T̂ − t)^(−p) over the points the fit could have
 * used (within three decades of the largest gradient), C from the mean residual.
 */
function fittedLine(points: [number, number][], p: number): [number, number][] {
  const usable = points.filter(([s, g]) => positive(s) && positive(g));
  if (usable.length < 2) return [];
  const top = Math.max(...usable.map(([, g]) => g));
  const window = usable.filter(([, g]) => g >= top / 1e3);
  if (window.length < 2) return [];
  const lnC = window.reduce((sum, [s, g]) => sum + Math.log(g) + p * Math.log(s), 0) / window.length;
  const sMin = Math.min(...window.map(([s]) => s));
  const sMax = Math.max(...window.map(([s]) => s));
  return [sMin, sMax].map((s) => [s, Math.exp(lnC - p * Math.log(s))]);
}

function GradientVsTimeToBlowup({ plots, exponent, T }: { plots: CandidatePlots; exponent: number | null; T: number | null }) {
  const data = useMemo(() => plots.gradientVsTimeToBlowup.filter(([s, g]) => positive(s) && positive(g)), [plots]);
  const option = useMemo(() => {
    const fit = exponent !== null ? fittedLine(data, exponent) : [];
    return {
      grid: { left: 64, right: 24, top: 34, bottom: 40 },
      tooltip,
      legend: { top: 0, right: 0, itemWidth: 16, textStyle: { fontSize: 11 } },
      xAxis: { type: 'log', name: 'T̂ − t', nameLocation: 'middle', nameGap: 26, axisLabel },
      yAxis: { type: 'log', name: 'max|∇u|', nameTextStyle: { align: 'left' }, axisLabel },
      series: [
        { type: 'scatter', name: 'max|∇u|', data, symbolSize: 4, itemStyle: { color: palette.info } },
        ...(fit.length
          ? [{ type: 'line', name: `fit, p = ${formatNumber(exponent, 3)}`, data: fit, showSymbol: false, lineStyle: { color: palette.ember, width: 2, type: 'dashed' }, itemStyle: { color: palette.ember } }]
          : []),
      ],
    };
  }, [data, exponent]);
  if (T === null) return <p className="chart-empty">No finite T̂ was fitted, so there is no time to blow-up to plot against.</p>;
  if (data.length === 0) return <p className="chart-empty">No samples before T̂ yet.</p>;
  return <Chart option={option} label="max|∇u| against T̂ − t, log-log, with the fitted power law" points={data.length} />;
}

function RescaledProfiles({ plots }: { plots: CandidatePlots }) {
  const profiles = plots.rescaledProfiles;
  const points = profiles.reduce((n, p) => n + p.y.length, 0);
  const option = useMemo(
    () => ({
      grid: { left: 56, right: 24, top: 34, bottom: 40 },
      tooltip,
      legend: { top: 0, right: 0, itemWidth: 16, textStyle: { fontSize: 11 } },
      xAxis: { type: 'log', name: 'y = r / √(T̂ − t)', nameLocation: 'middle', nameGap: 26, axisLabel },
      yAxis: { type: 'value', name: 'h', nameTextStyle: { align: 'left' }, axisLabel },
      series: profiles.map((profile, i) => {
        const color = PROFILE_RAMP[Math.max(0, PROFILE_RAMP.length - profiles.length + i)]!;
        return {
          type: 'line',
          name: `t = ${formatNumber(profile.t, 5)}`,
          data: profile.y.map((y, k) => [y, profile.h[k]!]).filter(([y]) => positive(y!)),
          showSymbol: false,
          lineStyle: { color, width: 1.6 },
          itemStyle: { color },
        };
      }),
    }),
    [profiles],
  );
  if (profiles.length === 0) return <p className="chart-empty">No checkpoint before T̂ to rescale, or no finite T̂.</p>;
  return (
    <>
      <Chart option={option} label="Rescaled profiles h against y, overlaid for a self-similarity check" points={points} />
      {profiles.length === 1 ? (
        <p className="evidence-plots__note">Only one checkpoint lies before T̂, so there is nothing to overlay yet; a finer run, or more frequent checkpoints, gives more.</p>
      ) : null}
    </>
  );
}

function History({ plots }: { plots: CandidatePlots }) {
  const option = useMemo(() => {
    const grad = plots.history.filter((h) => positive(h.gradMax)).map((h) => [h.t, h.gradMax]);
    const tension = plots.history.filter((h) => positive(h.tension)).map((h) => [h.t, h.tension]);
    return {
      grid: { left: 64, right: 64, top: 34, bottom: 40 },
      tooltip,
      // Centred, so it keeps clear of the two axis names at the top corners.
      legend: { top: 0, left: 'center', itemWidth: 16, textStyle: { fontSize: 11 } },
      xAxis: { type: 'value', name: 't', nameLocation: 'middle', nameGap: 26, scale: true, axisLabel },
      yAxis: [
        { type: 'log', name: 'max|∇u|', nameTextStyle: { align: 'left' }, axisLabel },
        { type: 'log', name: '‖τ‖', nameTextStyle: { align: 'right' }, axisLabel, splitLine: { show: false } },
      ],
      series: [
        { type: 'line', name: 'max|∇u|', data: grad, showSymbol: false, lineStyle: { color: palette.ember, width: 1.6 }, itemStyle: { color: palette.ember } },
        { type: 'line', name: '‖τ‖ (right axis)', yAxisIndex: 1, data: tension, showSymbol: false, lineStyle: { color: palette.info, width: 1.6, type: 'dashed' }, itemStyle: { color: palette.info } },
      ],
    };
  }, [plots]);
  if (plots.history.length === 0) return <p className="chart-empty">This run recorded no samples.</p>;
  return <Chart option={option} label="History of max|∇u| and tension against t, log scales" points={plots.history.length} />;
}

/** The three pictures a reviewer judges from. */
export function EvidencePlots({ plots, exponent, T }: { plots: CandidatePlots; exponent: number | null; T: number | null }) {
  return (
    <div className="evidence-plots" data-testid="evidence-plots">
      <figure className="evidence-plots__cell">
        <figcaption>Growth of the gradient: max|∇u| against T̂ − t (log-log). A straight line of slope −p is a power law.</figcaption>
        <GradientVsTimeToBlowup plots={plots} exponent={exponent} T={T} />
      </figure>
      <figure className="evidence-plots__cell">
        <figcaption>Self-similarity check: profiles h against y = r / √(T̂ − t), last checkpoints overlaid. Type I profiles collapse onto one curve.</figcaption>
        <RescaledProfiles plots={plots} />
      </figure>
      <figure className="evidence-plots__cell evidence-plots__cell--wide">
        <figcaption>History: max|∇u| and tension ‖τ‖ against t. A steep steady state shows the tension falling while the gradient levels off.</figcaption>
        <History plots={plots} />
      </figure>
    </div>
  );
}
