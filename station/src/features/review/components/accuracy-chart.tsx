import { DEFAULT_TOLERANCE_PCT, type AccuracyRow } from '@tareline/protocol';
import { useMemo } from 'react';
import { Chart } from '../../../components/chart/lazy-chart';
import { themeColor } from '../../../components/chart/theme-color';
import type { ChartOptions } from '../../../components/chart/uplot-chart';
import { dayText } from '../../../lib/dates';

type Colors = (name: string, alpha?: number) => string;

/**
 * One group's deviation over time: the mean with its spread (mean ± one standard deviation,
 * shaded), the 95th percentile of |deviation|, and the default tolerance of ±1 % for scale (a
 * material may set its own; the figures carry none).
 */
export function accuracySeries(
  rows: readonly AccuracyRow[],
  color: Colors,
): { options: ChartOptions; data: (number | null)[][] } {
  const sorted = [...rows].sort((a, b) => a.bucketStart.localeCompare(b.bucketStart));
  const xs = sorted.map((r) => Date.parse(r.bucketStart) / 1000);
  const mean = sorted.map((r) => r.meanDeviationPct);
  const withSd = (sign: 1 | -1) =>
    sorted.map((r) =>
      r.meanDeviationPct === null || r.sdDeviationPct === null
        ? null
        : r.meanDeviationPct + sign * r.sdDeviationPct,
    );
  const flat = (v: number) => xs.map(() => v);
  const pct = (_u: unknown, v: number | null) => (v === null ? '\u2013' : `${v.toFixed(2)} %`);
  const thin = { width: 1, points: { show: false }, value: pct };
  return {
    data: [
      xs,
      mean,
      withSd(1),
      withSd(-1),
      sorted.map((r) => r.p95AbsDeviationPct),
      flat(DEFAULT_TOLERANCE_PCT),
      flat(-DEFAULT_TOLERANCE_PCT),
    ],
    options: {
      // Buckets are UTC days and weeks: the axis shows them as such, not in local time.
      scales: { x: { time: false } },
      axes: [
        {
          stroke: color('muted'),
          values: (_u, splits) =>
            splits.map((s) => dayText(new Date(s * 1000).toISOString(), { utc: true })),
        },
        { label: '% off ratio', stroke: color('muted') },
      ],
      series: [
        {
          label: 'Week or day',
          value: (_u, v) => dayText(new Date(v * 1000).toISOString(), { utc: true }),
        },
        { label: 'Mean', stroke: color('steel'), width: 2, value: pct },
        { label: 'Mean + SD', stroke: color('steel', 0.4), ...thin },
        { label: 'Mean − SD', stroke: color('steel', 0.4), ...thin },
        { label: '95 % within', stroke: color('over'), dash: [6, 4], ...thin },
        { label: `+${DEFAULT_TOLERANCE_PCT} %`, stroke: color('go'), dash: [2, 4], ...thin },
        { label: `−${DEFAULT_TOLERANCE_PCT} %`, stroke: color('go'), dash: [2, 4], ...thin },
      ],
      bands: [{ series: [2, 3], fill: color('steel', 0.15) }],
    },
  };
}

export function AccuracyChart({ name, rows }: { name: string; rows: readonly AccuracyRow[] }) {
  const chart = useMemo(() => accuracySeries(rows, themeColor), [rows]);
  return (
    <figure
      role="img"
      aria-label={`${name}: deviation over ${rows.length} ${rows.length === 1 ? 'period' : 'periods'}`}
      className="rounded-xl bg-panel p-3"
    >
      <figcaption className="mb-1 text-lg font-semibold">{name}</figcaption>
      <Chart options={chart.options} data={chart.data} height={200} />
    </figure>
  );
}
