import { HeatmapChart, LineChart, ScatterChart } from 'echarts/charts';
import {
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TitleComponent,
  TooltipComponent,
  VisualMapComponent,
} from 'echarts/components';
import * as echarts from 'echarts/core';
import type { EChartsCoreOption, ECharts } from 'echarts/core';
import { CanvasRenderer } from 'echarts/renderers';
import { useEffect, useRef } from 'react';
import { fontFamily } from '@/app/theme';

// Only what Kiln draws, so the bundle stays small (echarts/core with explicit registration).
echarts.use([
  LineChart,
  HeatmapChart,
  ScatterChart,
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TitleComponent,
  TooltipComponent,
  VisualMapComponent,
  CanvasRenderer,
]);

export interface ChartProps {
  option: EChartsCoreOption;
  height?: number;
  /** Accessible name of the plot. */
  label: string;
  /** Number of plotted points, exposed as `data-points` (tests and screen readers). */
  points?: number;
  onClick?: (params: { data?: unknown; dataIndex: number; seriesIndex?: number }) => void;
  /** Replace the whole option instead of merging (when series come and go). */
  notMerge?: boolean;
}

/** A thin ECharts wrapper: one instance per mount, resized with its box, option updates merged. */
export function Chart({ option, height = 260, label, points, onClick, notMerge = true }: ChartProps) {
  const box = useRef<HTMLDivElement>(null);
  const chart = useRef<ECharts | null>(null);
  const clickRef = useRef(onClick);
  clickRef.current = onClick;

  useEffect(() => {
    const element = box.current!;
    const instance = echarts.init(element, undefined, { renderer: 'canvas' });
    chart.current = instance;
    instance.on('click', (params) => clickRef.current?.(params as never));
    const observer = new ResizeObserver(() => instance.resize());
    observer.observe(element);
    return () => {
      observer.disconnect();
      instance.dispose();
      chart.current = null;
    };
  }, []);

  useEffect(() => {
    chart.current?.setOption(
      { textStyle: { fontFamily }, animation: false, ...option },
      { notMerge, lazyUpdate: true },
    );
  }, [option, notMerge]);

  return <div ref={box} className="chart" role="img" aria-label={label} data-points={points} style={{ height }} />;
}
