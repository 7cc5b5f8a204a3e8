import { initialProfile, type RunSpec } from '@kiln/shared';
import { useMemo } from 'react';
import { Chart } from '@/components/chart';
import { palette } from '@/config/palette';
import { formatNumber } from '@/lib/format';

/** h₀(r) of the base spec, computed in the browser by the shared engine (cheap: no grid, no operator). */
export function InitialProfileChart({ spec }: { spec: Pick<RunSpec, 'domain' | 'initial'> | null }) {
  const data = useMemo(() => {
    if (!spec) return null;
    try {
      const { r, h } = initialProfile(spec, 241);
      return Array.from(r, (x, i) => [x, h[i]!]);
    } catch {
      return null;
    }
  }, [spec]);

  if (!spec || !data) {
    return <div className="chart-empty">Fix the domain and initial data above to see h₀(r).</div>;
  }
  const ball = spec.domain.kind === 'ball';
  const end = ball ? (spec.domain as { boundaryAngle: number }).boundaryAngle : Math.PI;
  const option = {
    grid: { left: 52, right: 20, top: 24, bottom: 40 },
    tooltip: { trigger: 'axis', valueFormatter: (v: number) => formatNumber(v, 4) },
    xAxis: {
      type: 'value',
      name: ball ? 'r' : 'r (rad)',
      nameLocation: 'middle',
      nameGap: 26,
      min: 0,
      max: ball ? 1 : Math.PI,
      axisLabel: { formatter: (v: number) => (ball ? formatNumber(v, 2) : `${formatNumber(v / Math.PI, 2)}π`) },
    },
    yAxis: {
      type: 'value',
      name: 'h₀ (rad)',
      axisLabel: { formatter: (v: number) => `${formatNumber(v / Math.PI, 2)}π` },
    },
    series: [
      {
        type: 'line',
        data,
        showSymbol: false,
        lineStyle: { color: palette.ember, width: 2 },
        markLine: {
          symbol: 'none',
          silent: true,
          lineStyle: { color: palette.inkMuted, type: 'dashed' },
          label: { formatter: ball ? 'h(1) = α' : 'h(π) = π', color: palette.inkMuted, position: 'insideStartTop' },
          data: [{ yAxis: end }],
        },
      },
    ],
  };
  return <Chart option={option} height={220} label="Initial profile h₀(r)" points={data.length} />;
}
