import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

export type ChartOptions = Omit<uPlot.Options, 'width' | 'height'>;

/**
 * A uPlot chart as wide as its box. Loaded on demand (`lazy-chart.tsx`): the bench screen never
 * downloads it.
 */
export default function UPlotChart({
  options,
  data,
  height = 260,
}: {
  options: ChartOptions;
  /** The x values, then one array per series after the first. */
  data: readonly (readonly (number | null)[])[];
  height?: number;
}) {
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const width = () => Math.max(el.clientWidth, 320);
    const plot = new uPlot({ ...options, width: width(), height }, data as uPlot.AlignedData, el);
    const resize =
      typeof ResizeObserver === 'undefined'
        ? null
        : new ResizeObserver(() => plot.setSize({ width: width(), height }));
    resize?.observe(el);
    return () => {
      resize?.disconnect();
      plot.destroy();
    };
  }, [options, data, height]);
  return <div ref={box} className="w-full" />;
}
