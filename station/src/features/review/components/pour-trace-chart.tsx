const WIDTH = 720;
const HEIGHT = 240;
const PAD = { left: 56, right: 12, top: 12, bottom: 36 };

/**
 * The pour trace as a line: net grams over seconds since the batch started. Each part's pour
 * starts near zero again (the hub tares between parts), so the saw-tooth shows each pour's
 * shape: a steady pour rises smoothly, dribbles near the target show as steps.
 */
export function PourTraceChart({ trace }: { trace: [number, number][] }) {
  if (trace.length < 2) {
    return <p className="text-muted">No pour trace was recorded for this batch.</p>;
  }
  const endS = Math.max(trace.at(-1)![0] / 1000, 1);
  const grams = trace.map(([, g]) => g);
  const lowG = Math.min(0, ...grams);
  const highG = Math.max(1, ...grams);
  const x = (ms: number) => PAD.left + (ms / 1000 / endS) * (WIDTH - PAD.left - PAD.right);
  const y = (g: number) =>
    PAD.top + (1 - (g - lowG) / (highG - lowG)) * (HEIGHT - PAD.top - PAD.bottom);
  const points = trace.map(([ms, g]) => `${x(ms).toFixed(1)},${y(g).toFixed(1)}`).join(' ');
  const label = `Pour trace: ${trace.length} readings over ${endS.toFixed(0)} s, highest ${highG.toFixed(1)} g`;
  return (
    <figure className="rounded-xl bg-panel p-3">
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-label={label} className="w-full">
        <line x1={PAD.left} x2={WIDTH - PAD.right} y1={y(0)} y2={y(0)} className="stroke-line" />
        <line
          x1={PAD.left}
          x2={PAD.left}
          y1={PAD.top}
          y2={HEIGHT - PAD.bottom}
          className="stroke-line"
        />
        <text x={PAD.left - 6} y={y(highG) + 4} textAnchor="end" className="fill-muted text-xs">
          {highG.toFixed(0)} g
        </text>
        <text x={PAD.left - 6} y={y(0) + 4} textAnchor="end" className="fill-muted text-xs">
          0 g
        </text>
        <text x={WIDTH - PAD.right} y={HEIGHT - 10} textAnchor="end" className="fill-muted text-xs">
          {endS.toFixed(0)} s
        </text>
        <polyline points={points} fill="none" strokeWidth={2} className="stroke-steel" />
      </svg>
      <figcaption className="mt-1 text-sm text-muted">
        Net weight on the scale through the batch; the hub tares before each part.
      </figcaption>
    </figure>
  );
}
