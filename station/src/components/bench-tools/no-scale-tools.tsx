import { fillMarksCm, MixInputError, pumpStrokes, type CupShape } from '@tareline/protocol';
import { useState } from 'react';
import { asNumber, NumberField } from '../form/field';

/** One part of the mix as the tools need it: what it is called, its mass and its volume. */
export interface ToolPart {
  label: string;
  massG: number;
  volumeCm3: number;
}

const fixed = (n: number, digits: number) => n.toFixed(digits);

/** Runs one of the protocol's bench tools; a wrong size becomes its message, not a crash. */
function attempt<T>(run: () => T): { value: T } | { problem: string } {
  try {
    return { value: run() };
  } catch (err) {
    if (err instanceof MixInputError) return { problem: err.message };
    throw err;
  }
}

/**
 * Measuring without a scale: fill marks on a round cup for a mix by volume, and the strokes of
 * metered pumps. Neither is weighed, so nothing here is judged or recorded by the hub.
 */
export function NoScaleTools({ parts }: { parts: readonly ToolPart[] }) {
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <FillMarks parts={parts} />
      <PumpStrokes parts={parts} />
    </div>
  );
}

function useNumber(initial: string) {
  const [raw, setRaw] = useState(initial);
  return { raw, value: asNumber(raw), onChange: setRaw };
}

function FillMarks({ parts }: { parts: readonly ToolPart[] }) {
  const bottom = useNumber('8');
  const top = useNumber('10');
  const height = useNumber('12');
  const cup: CupShape = {
    bottomDiameterCm: bottom.value ?? NaN,
    topDiameterCm: top.value ?? NaN,
    heightCm: height.value ?? NaN,
  };
  const marks = attempt(() =>
    fillMarksCm(
      cup,
      parts.map((p) => p.volumeCm3),
    ),
  );
  const equal = parts.length === 2 && Math.abs(parts[0]!.volumeCm3 - parts[1]!.volumeCm3) < 1e-9;
  return (
    <section aria-labelledby="marks-title" className="rounded-2xl bg-panel p-6 ring-1 ring-line">
      <h3 id="marks-title" className="text-2xl font-bold">
        Fill marks on the cup
      </h3>
      <p className="mt-1 text-lg text-muted">
        Measure the cup inside, in cm. Mark each height from the bottom, fill part by part to its
        mark.
        {equal && ' Equal volumes: in a tapered cup the second mark is not twice the first.'}
      </p>
      <div className="mt-4 flex flex-wrap gap-4">
        {(
          [
            ['Bottom diameter', bottom],
            ['Top diameter', top],
            ['Usable height', height],
          ] as const
        ).map(([label, field]) => (
          <NumberField
            key={label}
            label={label}
            unit="cm"
            inputClassName="w-28"
            value={field.raw}
            onChange={(e) => field.onChange(e.target.value)}
          />
        ))}
      </div>
      {'value' in marks ? (
        <ol aria-label="Fill marks" className="mt-4 space-y-1 text-xl">
          {marks.value.map((h, i) => (
            <li key={parts[i]!.label}>
              Fill {parts[i]!.label} up to{' '}
              <strong className="tabular-nums">{fixed(h, 1)} cm</strong>{' '}
              <span className="text-muted">({fixed(parts[i]!.volumeCm3, 1)} cm³)</span>
            </li>
          ))}
        </ol>
      ) : (
        <p className="mt-4 text-lg font-semibold text-over">{marks.problem}</p>
      )}
    </section>
  );
}

function PumpStrokes({ parts }: { parts: readonly ToolPart[] }) {
  const [perStroke, setPerStroke] = useState<string[]>(parts.map(() => ''));
  return (
    <section aria-labelledby="pumps-title" className="rounded-2xl bg-panel p-6 ring-1 ring-line">
      <h3 id="pumps-title" className="text-2xl font-bold">
        Metered pumps
      </h3>
      <p className="mt-1 text-lg text-muted">
        Weigh ten strokes of each pump once and enter a tenth of it: the strokes follow.
      </p>
      <ul className="mt-4 space-y-4">
        {parts.map((part, i) => {
          const gps = asNumber(perStroke[i]);
          const result =
            gps === undefined ? undefined : attempt(() => pumpStrokes(part.massG, gps));
          return (
            <li key={part.label} className="flex flex-wrap items-end gap-4">
              <NumberField
                label={`${part.label}: grams per stroke`}
                unit="g"
                value={perStroke[i] ?? ''}
                onChange={(e) =>
                  setPerStroke((all) => all.map((v, j) => (j === i ? e.target.value : v)))
                }
              />
              {result && 'value' in result && (
                <p className="text-xl">
                  <strong className="tabular-nums">{result.value.wholeStrokes} strokes</strong> for{' '}
                  {fixed(part.massG, 1)} g: they give {fixed(result.value.deliveredG, 1)} g
                </p>
              )}
              {result && 'problem' in result && (
                <p className="text-lg font-semibold text-over">{result.problem}</p>
              )}
            </li>
          );
        })}
      </ul>
    </section>
  );
}
