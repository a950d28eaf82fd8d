import { zodResolver } from '@hookform/resolvers/zod';
import type { SimulatorStep } from '@tareline/protocol';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { useRunSimulator } from '../api/run-simulator';

const button =
  'min-h-14 rounded-xl border-2 border-steel px-4 text-lg font-semibold disabled:opacity-50';
const input = 'min-h-14 w-28 rounded-lg border border-line bg-panel px-3 text-lg';

const weightFormSchema = z.object({
  massG: z.coerce
    .number({ error: 'Enter the weight’s mass in grams' })
    .positive({ error: 'A weight weighs more than 0 g' })
    .max(100_000, { error: 'At most 100 000 g' }),
});

const faultsFormSchema = z.object({
  offsetG: z.coerce
    .number({ error: 'Enter the offset in grams (0 for none)' })
    .min(-1000, { error: 'Between −1000 and 1000 g' })
    .max(1000, { error: 'Between −1000 and 1000 g' }),
  spanPpm: z.coerce
    .number({ error: 'Enter the span error in ppm (0 for none)' })
    .min(-100_000, { error: 'Between −100 000 and 100 000 ppm' })
    .max(100_000, { error: 'Between −100 000 and 100 000 ppm' }),
  spreadG: z.coerce
    .number({ error: 'Enter the spread in grams (0 for none)' })
    .min(0, { error: 'A spread is 0 g or more' })
    .max(1000, { error: 'At most 1000 g' }),
});

/**
 * The simulator's reference weight (placed and lifted like the real one) and its own faults — an
 * offset, a span error and a spread between placements — so a scale check can fail on purpose.
 */
export function ReferenceWeightControls({ benchId }: { benchId: string }) {
  const run = useRunSimulator(benchId);
  const send = (steps: SimulatorStep[]) => run.mutate(steps);
  const weight = useForm<
    z.input<typeof weightFormSchema>,
    unknown,
    z.output<typeof weightFormSchema>
  >({ resolver: zodResolver(weightFormSchema), defaultValues: { massG: '200' } });
  const faults = useForm<
    z.input<typeof faultsFormSchema>,
    unknown,
    z.output<typeof faultsFormSchema>
  >({
    resolver: zodResolver(faultsFormSchema),
    defaultValues: { offsetG: '0', spanPpm: '0', spreadG: '0' },
  });
  const faultError =
    faults.formState.errors.offsetG ??
    faults.formState.errors.spanPpm ??
    faults.formState.errors.spreadG;

  return (
    <div className="mt-4 space-y-3 border-t border-line pt-3">
      <h3 className="text-lg font-semibold">Reference weight</h3>
      <form
        noValidate
        className="flex flex-wrap items-center gap-2"
        onSubmit={weight.handleSubmit(({ massG }) =>
          send([{ do: 'place-weight', massG }, { do: 'settle' }]),
        )}
      >
        <label className="flex items-center gap-2 text-lg">
          Mass
          <input inputMode="decimal" className={input} {...weight.register('massG')} />g
        </label>
        <button type="submit" className={button} disabled={run.isPending}>
          Place the weight
        </button>
        <button
          type="button"
          className={button}
          disabled={run.isPending}
          onClick={() => send([{ do: 'lift-weight' }, { do: 'settle' }])}
        >
          Lift the weight
        </button>
        {weight.formState.errors.massG && (
          <p role="alert" className="w-full text-over">
            {weight.formState.errors.massG.message}
          </p>
        )}
      </form>
      <h3 className="text-lg font-semibold">The simulated scale&apos;s own error</h3>
      <form
        noValidate
        className="flex flex-wrap items-center gap-3"
        onSubmit={faults.handleSubmit((values) => send([{ do: 'set-scale-error', ...values }]))}
      >
        <label className="flex items-center gap-2 text-lg">
          Offset
          <input inputMode="decimal" className={input} {...faults.register('offsetG')} />g
        </label>
        <label className="flex items-center gap-2 text-lg">
          Span error
          <input inputMode="decimal" className={input} {...faults.register('spanPpm')} />
          ppm
        </label>
        <label className="flex items-center gap-2 text-lg">
          Spread (sd)
          <input inputMode="decimal" className={input} {...faults.register('spreadG')} />g
        </label>
        <button type="submit" className={button} disabled={run.isPending}>
          Set the error
        </button>
        {faultError && (
          <p role="alert" className="w-full text-over">
            {faultError.message}
          </p>
        )}
      </form>
    </div>
  );
}
