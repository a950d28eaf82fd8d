import { zodResolver } from '@hookform/resolvers/zod';
import type { SimulatorStep } from '@tareline/protocol';
import { lazy, Suspense } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { useRunSimulator } from '../api/run-simulator';

// Scale-check practice is rare at the bench: its controls load when the panel is drawn.
const ReferenceWeightControls = lazy(() =>
  import('./reference-weight-controls').then((m) => ({ default: m.ReferenceWeightControls })),
);

const button =
  'min-h-14 rounded-xl border-2 border-steel px-4 text-lg font-semibold disabled:opacity-50';

/** Pours offered as one press: a fast pour, then smaller and slower ones to creep up on a target. */
const QUICK_POURS = [
  { grams: 50, rateGPerS: 10 },
  { grams: 10, rateGPerS: 5 },
  { grams: 1, rateGPerS: 1 },
  { grams: 0.1, rateGPerS: 0.2 },
];

/** One press each: what a person does to a balance, in the order they would. */
const ACTIONS: { label: string; steps: SimulatorStep[] }[] = [
  { label: 'Place a 40 g cup', steps: [{ do: 'place-cup', massG: 40 }, { do: 'settle' }] },
  { label: 'Lift the cup', steps: [{ do: 'lift-cup' }] },
  { label: 'Put the cup back', steps: [{ do: 'return-cup' }, { do: 'settle' }] },
  ...QUICK_POURS.map(({ grams, rateGPerS }) => ({
    label: `Pour ${grams} g`,
    steps: [{ do: 'pour', grams, rateGPerS }, { do: 'settle' }] satisfies SimulatorStep[],
  })),
  { label: 'Unplug the cable', steps: [{ do: 'unplug' }] },
  { label: 'Plug it back', steps: [{ do: 'replug' }] },
];

const pourFormSchema = z.object({
  grams: z.coerce
    .number({ error: 'Enter the grams to pour' })
    .positive({ error: 'Pour more than 0 g' })
    .max(10_000, { error: 'At most 10 000 g at once' }),
});

/**
 * Hands for a bench whose scale is the simulator (no balance connected): place and lift a cup,
 * pour, unplug the cable. What the hub then reads is what a real balance would print.
 */
export function SimulatorPanel({ benchId }: { benchId: string }) {
  const run = useRunSimulator(benchId);
  const form = useForm<z.input<typeof pourFormSchema>, unknown, z.output<typeof pourFormSchema>>({
    resolver: zodResolver(pourFormSchema),
    defaultValues: { grams: '' },
  });
  const send = (steps: SimulatorStep[]) => run.mutate(steps);
  const pour = (grams: number, rateGPerS: number) =>
    send([{ do: 'pour', grams, rateGPerS }, { do: 'settle' }]);

  return (
    <section
      aria-labelledby={`simulator-${benchId}`}
      className="rounded-xl border-2 border-dashed border-line p-4"
    >
      <h2 id={`simulator-${benchId}`} className="text-xl font-semibold">
        Simulated scale
      </h2>
      <p className="mb-3 text-muted">
        No balance is connected to this bench: these buttons act on the simulator the hub reads.
      </p>
      <div className="flex flex-wrap gap-2">
        {ACTIONS.map(({ label, steps }) => (
          <button
            key={label}
            type="button"
            className={button}
            disabled={run.isPending}
            onClick={() => send(steps)}
          >
            {label}
          </button>
        ))}
      </div>
      <form
        noValidate
        className="mt-3 flex flex-wrap items-start gap-2"
        onSubmit={form.handleSubmit(({ grams }) => {
          // A realistic flow: fast for big pours, a trickle for small ones.
          pour(grams, Math.min(20, Math.max(0.2, grams / 5)));
          form.reset();
        })}
      >
        <label className="flex items-center gap-2 text-lg">
          Pour
          <input
            inputMode="decimal"
            className="min-h-14 w-28 rounded-lg border border-line bg-panel px-3 text-lg"
            aria-invalid={form.formState.errors.grams ? true : undefined}
            aria-describedby={form.formState.errors.grams ? 'sim-grams-error' : undefined}
            {...form.register('grams')}
          />
          g
        </label>
        <button type="submit" className={button} disabled={run.isPending}>
          Pour it
        </button>
        {form.formState.errors.grams && (
          <p id="sim-grams-error" role="alert" className="w-full text-over">
            {form.formState.errors.grams.message}
          </p>
        )}
      </form>
      <Suspense fallback={null}>
        <ReferenceWeightControls benchId={benchId} />
      </Suspense>
      {run.isPending && <p className="mt-2 text-muted">The simulator is busy…</p>}
      {run.isError && (
        <p role="alert" className="mt-2 text-over">
          {run.error.message}
        </p>
      )}
    </section>
  );
}
