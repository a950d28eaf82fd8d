import { toleranceBand, type Batch } from '@tareline/protocol';
import { useMemo } from 'react';
import { Chart } from '../../../components/chart/lazy-chart';
import { themeColor } from '../../../components/chart/theme-color';
import type { ChartOptions } from '../../../components/chart/uplot-chart';

type Colors = (name: string, alpha?: number) => string;
type TraceBatch = Pick<Batch, 'trace' | 'parts' | 'tolerancePct'>;

/**
 * The chart's series: the net weight over seconds, each part's target as a dashed line and,
 * for the parts after the first, the band the hub judged the pour against (target ± the
 * tolerance, `toleranceBand` of the protocol). Part A has no band: it sets the scale of the rest.
 */
export function pourTraceSeries(
  batch: TraceBatch,
  color: Colors,
): { options: ChartOptions; data: number[][] } {
  const trace = batch.trace ?? [];
  const xs = trace.map(([ms]) => ms / 1000);
  const flat = (g: number) => xs.map(() => g);
  const data: number[][] = [xs, trace.map(([, g]) => g)];
  const series: NonNullable<ChartOptions['series']> = [
    { label: 'Seconds' },
    {
      label: 'Net weight',
      stroke: color('steel'),
      width: 2,
      value: (_u, v: number | null) => (v === null ? '\u2013' : `${v} g`),
    },
  ];
  const bands: NonNullable<ChartOptions['bands']> = [];
  batch.parts.forEach((part, i) => {
    if (part.targetG <= 0) return;
    series.push({
      label: `${part.label} target`,
      stroke: color('go'),
      dash: [6, 4],
      width: 1,
      points: { show: false },
    });
    data.push(flat(part.targetG));
    if (i === 0) return;
    const band = toleranceBand(part.targetG, batch.tolerancePct);
    const high = data.length;
    series.push(
      { label: `${part.label} high`, stroke: color('go', 0.5), points: { show: false } },
      { label: `${part.label} low`, stroke: color('go', 0.5), points: { show: false } },
    );
    data.push(flat(band.highG), flat(band.lowG));
    bands.push({ series: [high, high + 1], fill: color('go', 0.15) });
  });
  return {
    data,
    options: {
      scales: { x: { time: false } },
      axes: [
        { label: 's', stroke: color('muted') },
        { label: 'g', stroke: color('muted') },
      ],
      series,
      bands,
      legend: { show: true },
      cursor: { drag: { x: true, y: false } },
    },
  };
}

/**
 * The pour trace: net grams over seconds since the batch started. Each part's pour starts near
 * zero again (the hub tares between parts), so the saw-tooth shows each pour's shape against its
 * target: a steady pour rises smoothly, dribbles near the target show as steps.
 */
export function PourTraceChart({ batch }: { batch: TraceBatch }) {
  const trace = batch.trace ?? [];
  const chart = useMemo(() => pourTraceSeries(batch, themeColor), [batch]);
  if (trace.length < 2) {
    return <p className="text-muted">No pour trace was recorded for this batch.</p>;
  }
  const endS = Math.max(trace.at(-1)![0] / 1000, 1);
  const highG = Math.max(1, ...trace.map(([, g]) => g));
  const label = `Pour trace: ${trace.length} readings over ${endS.toFixed(0)} s, highest ${highG.toFixed(1)} g`;
  return (
    <figure role="img" aria-label={label} className="rounded-xl bg-panel p-3">
      <Chart options={chart.options} data={chart.data} height={280} />
      <figcaption className="mt-1 text-sm text-muted">
        Net weight on the scale through the batch; the hub tares before each part. Dashed: each
        part&apos;s target; shaded: the band of ±{batch.tolerancePct} % each part after the first
        had to end in.
      </figcaption>
    </figure>
  );
}
