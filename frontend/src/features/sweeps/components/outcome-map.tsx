import type { Run, SweepAxis } from '@kiln/shared';
import { Card, Select, Skeleton } from 'antd';
import { useMemo, useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { Chart } from '@/components/chart';
import { EvidenceCaution } from '@/components/evidence-caution';
import { IconCheck, IconFlare, IconIdle, IconWarning } from '@/components/icons';
import { QueryError } from '@/components/query-error';
import { outcomeLook, runStateLook } from '@/components/run-status';
import { paths } from '@/config/paths';
import { formatNumber } from '@/lib/format';
import { useAllSweepRuns } from '../api/get-sweep-runs';
import { axisLabel, axisValuesOf, formatAxisValue } from './sweep-axes';

/** The four kinds of cell; the colour always comes with the word or T̂ written in the cell. */
export const CELL_KINDS = [
  { key: 'converged', label: 'Converged', color: '#cfe8dc', text: '#145a41', icon: <IconCheck /> },
  { key: 'blowup', label: 'Blow-up (T̂ shown)', color: '#f2b48a', text: '#6b2a06', icon: <IconFlare /> },
  { key: 'other', label: 'Other outcome', color: '#d7dbe0', text: '#2f3a45', icon: <IconWarning /> },
  { key: 'pending', label: 'Not finished', color: '#ffffff', text: '#5a6672', icon: <IconIdle /> },
] as const;
type CellKind = (typeof CELL_KINDS)[number]['key'];

/** Grid margins of the map, in pixels (tests aim at cells with them). */
export const MAP_GRID = { left: 84, right: 16, top: 16, bottom: 56 };

function cellOf(run: Run): { kind: CellKind; text: string } {
  if (run.state === 'finished' && run.outcome) {
    if (run.outcome === 'converged') return { kind: 'converged', text: 'converged' };
    if (run.outcome === 'blowup') {
      const T = (run.summary as { blowup?: { T?: number | null } | null } | null)?.blowup?.T ?? null;
      return { kind: 'blowup', text: T === null ? 'blow-up\nT̂ n/a' : `blow-up\nT̂ ${formatNumber(T, 3)}` };
    }
    return { kind: 'other', text: outcomeLook[run.outcome].label.toLowerCase() };
  }
  if (run.state === 'failed' || run.state === 'cancelled') return { kind: 'other', text: runStateLook[run.state].label.toLowerCase() };
  return { kind: 'pending', text: runStateLook[run.state].label.toLowerCase() };
}

const same = (a: number, b: number) => Math.abs(a - b) <= 1e-12 * Math.max(1, Math.abs(a), Math.abs(b));

/**
 * Outcomes over two chosen axes (an ECharts heatmap). With more than two axes the
 * others are held at one chosen value each. Every cell opens its run.
 */
export function OutcomeMap({ sweepId, axes, live, version }: { sweepId: string; axes: SweepAxis[]; live: boolean; version: string }) {
  const navigate = useNavigate();
  const runs = useAllSweepRuns(sweepId, live, version);
  const [xPath, setXPath] = useState(axes[0]?.path);
  const [yPath, setYPath] = useState(axes[1]?.path);
  const [fixed, setFixed] = useState<Record<string, number>>({});

  const model = useMemo(() => {
    if (!runs.data || !xPath) return null;
    const xValues = axisValuesOf(axes.find((a) => a.path === xPath)!);
    const yAxis = yPath ? axes.find((a) => a.path === yPath) : undefined;
    const yValues = yAxis ? axisValuesOf(yAxis) : [Number.NaN];
    const others = axes.filter((a) => a.path !== xPath && a.path !== yPath);
    const held = Object.fromEntries(others.map((a) => [a.path, fixed[a.path] ?? axisValuesOf(a)[0]!]));
    const counts: Record<CellKind, number> = { converged: 0, blowup: 0, other: 0, pending: 0 };
    const data: { value: [number, number, number]; runId: string; text: string; kind: CellKind }[] = [];
    for (const run of runs.data) {
      if (!others.every((a) => same(run.axisValues[a.path]!, held[a.path]!))) continue;
      const xi = xValues.findIndex((v) => same(v, run.axisValues[xPath]!));
      const yi = yPath ? yValues.findIndex((v) => same(v, run.axisValues[yPath]!)) : 0;
      if (xi < 0 || yi < 0) continue;
      const cell = cellOf(run);
      counts[cell.kind] += 1;
      data.push({ value: [xi, yi, CELL_KINDS.findIndex((k) => k.key === cell.kind)], runId: run.id, text: cell.text, kind: cell.kind });
    }
    return { xValues, yValues, data, counts, others, held };
  }, [runs.data, axes, xPath, yPath, fixed]);

  if (axes.length === 0) {
    return (
      <Card title="Outcome map" className="panel">
        <p className="muted">This sweep has no axes (one run), so there is nothing to map. Open the run from the table.</p>
      </Card>
    );
  }

  const axisOptions = axes.map((a) => ({ value: a.path, label: axisLabel(a.path) }));
  const option = model
    ? {
        tooltip: {
          formatter: (p: { data: { value: [number, number, number]; text: string } }) => {
            const [xi, yi] = p.data.value;
            const y = yPath ? `<br/>${axisLabel(yPath)} = ${formatAxisValue(yPath, model.yValues[yi])}` : '';
            return `${axisLabel(xPath!)} = ${formatAxisValue(xPath!, model.xValues[xi])}${y}<br/><b>${p.data.text.replace('\n', ' ')}</b><br/>click to open the run`;
          },
        },
        grid: MAP_GRID,
        xAxis: {
          type: 'category',
          data: model.xValues.map((v) => formatAxisValue(xPath!, v)),
          name: axisLabel(xPath!),
          nameLocation: 'middle',
          nameGap: 32,
          splitArea: { show: false },
        },
        yAxis: {
          type: 'category',
          data: yPath ? model.yValues.map((v) => formatAxisValue(yPath, v)) : [''],
          name: yPath ? axisLabel(yPath) : '',
          nameLocation: 'middle',
          nameGap: 60,
        },
        visualMap: {
          type: 'piecewise',
          show: false,
          dimension: 2,
          pieces: CELL_KINDS.map((k, i) => ({ value: i, color: k.color })),
        },
        series: [
          {
            type: 'heatmap',
            data: model.data,
            itemStyle: { borderColor: '#8a96a3', borderWidth: 1 },
            label: {
              show: true,
              formatter: (p: { data: { text: string } }) => p.data.text,
              fontSize: 11,
              lineHeight: 14,
              color: '#1f2730',
            },
            emphasis: { itemStyle: { borderColor: '#1f2730', borderWidth: 2 } },
            cursor: 'pointer',
          },
        ],
      }
    : null;

  const height = Math.max(180, Math.min(520, (model?.yValues.length ?? 1) * 48 + MAP_GRID.top + MAP_GRID.bottom));

  return (
    <Card
      title="Outcome map"
      className="panel"
      extra={
        <div className="panel__extra">
          <label className="inline-field">
            <span>Across</span>
            <Select aria-label="Map across" value={xPath} onChange={setXPath} options={axisOptions.filter((o) => o.value !== yPath)} style={{ width: 170 }} />
          </label>
          {axes.length > 1 ? (
            <label className="inline-field">
              <span>Down</span>
              <Select aria-label="Map down" value={yPath} onChange={setYPath} options={axisOptions.filter((o) => o.value !== xPath)} style={{ width: 170 }} />
            </label>
          ) : null}
        </div>
      }
    >
      {runs.isPending ? (
        <Skeleton active paragraph={{ rows: 5 }} />
      ) : runs.isError ? (
        <QueryError what="the runs for the map" error={runs.error} onRetry={() => void runs.refetch()} />
      ) : model && option ? (
        <>
          {model.others.length ? (
            <div className="table-filters">
              {model.others.map((a) => (
                <label key={a.path} className="inline-field">
                  <span>{axisLabel(a.path)} held at</span>
                  <Select
                    value={model.held[a.path]}
                    onChange={(v) => setFixed((f) => ({ ...f, [a.path]: v }))}
                    options={axisValuesOf(a).map((v) => ({ value: v, label: formatAxisValue(a.path, v) }))}
                    style={{ width: 120 }}
                  />
                </label>
              ))}
            </div>
          ) : null}
          <div className="outcome-map" data-testid="outcome-map">
            <Chart
              option={option}
              height={height}
              label={`Outcome map across ${axisLabel(xPath!)}${yPath ? ` and ${axisLabel(yPath)}` : ''}`}
              points={model.data.length}
              onClick={(p) => {
                const datum = p.data as { runId?: string } | undefined;
                if (datum?.runId) navigate(paths.run.getHref(datum.runId));
              }}
            />
          </div>
          <ul className="map-legend" aria-label="Cells by kind">
            {CELL_KINDS.map((k) => (
              <li key={k.key} data-kind={k.key}>
                <span className="map-legend__swatch" style={{ background: k.color, color: k.text }}>
                  {k.icon}
                </span>
                {k.label} <strong data-testid={`map-count-${k.key}`}>{model.counts[k.key]}</strong>
              </li>
            ))}
          </ul>
          <details className="map-cells">
            <summary>The cells as a list (for keyboards and screen readers)</summary>
            <ul>
              {model.data.map((cell) => (
                <li key={cell.runId}>
                  <Link to={paths.run.getHref(cell.runId)}>
                    {axisLabel(xPath!)} = {formatAxisValue(xPath!, model.xValues[cell.value[0]])}
                    {yPath ? `, ${axisLabel(yPath)} = ${formatAxisValue(yPath, model.yValues[cell.value[1]])}` : ''}
                  </Link>
                  : {cell.text.replace('\n', ', ')}
                </li>
              ))}
            </ul>
          </details>
          <EvidenceCaution blowup compact />
        </>
      ) : null}
    </Card>
  );
}
