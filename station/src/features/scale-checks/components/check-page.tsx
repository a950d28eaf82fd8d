import { zodResolver } from '@hookform/resolvers/zod';
import type { ScaleCheck } from '@tareline/protocol/scale-checks';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useParams } from 'react-router-dom';
import { z } from 'zod';
import { Field } from '../../../components/form/field';
import { hasRole, useSession } from '../../../lib/auth';
import { useBenches } from '../../../lib/benches';
import { gramsText } from '../../../lib/grams';
import { useCancelCheck, useCheck, useCheckStatus, useStartCheck } from '../api/scale-checks';
import { CheckHistory } from './check-history';
import { outcomeText, sdText, signedGrams } from './check-words';

const button =
  'min-h-14 rounded-xl border-2 border-steel px-5 text-xl font-semibold disabled:opacity-50';

const startFormSchema = z.object({
  kind: z.enum(['routine', 'repeatability']),
  referenceG: z.coerce
    .number({ error: 'Enter the reference weight in grams' })
    .positive({ error: 'A reference weight weighs more than 0 g' })
    .max(100_000, { error: 'At most 100 000 g' }),
});

/**
 * A scale check at the bench, step by step: the hub zeroes the empty pan, asks for the reference
 * weight, and takes the stable reading itself; the page says what to do and shows the result.
 * Below it, the bench's check record and calibration due date.
 */
export function CheckPage() {
  const { benchId = '' } = useParams();
  const session = useSession();
  const bench = useBenches().data?.find((b) => b.id === benchId);
  const status = useCheckStatus(benchId);
  const [started, setStarted] = useState<number | null>(null);
  // A check already running at the bench (a reloaded page) is followed as if started here.
  const checkId = started ?? status.data?.runningCheckId ?? null;
  const check = useCheck(benchId, checkId);
  const mayCheck =
    hasRole(session, ['lead']) ||
    (hasRole(session, ['operator']) && session?.bench?.id === benchId);

  return (
    <section aria-labelledby="check-title" className="mx-auto max-w-5xl space-y-8">
      <div className="flex flex-wrap items-baseline justify-between gap-4">
        <h1 id="check-title" className="text-3xl font-bold">
          Scale check — {bench?.name ?? benchId}
        </h1>
        <Link to="/bench" className="text-xl underline">
          Back to the bench
        </Link>
      </div>
      {status.data?.message && !check.data && (
        <p role="status" className="text-xl font-semibold">
          {status.data.message}.
        </p>
      )}
      {check.data ? (
        <CheckInProgress
          benchId={benchId}
          check={check.data}
          onAgain={() => setStarted(null)}
          again={check.data.state !== 'waiting'}
          mayCancel={mayCheck}
        />
      ) : mayCheck ? (
        <StartForm benchId={benchId} onStarted={setStarted} />
      ) : (
        <p className="text-xl">
          A scale check is run by a lead, or by the operator signed in at this bench.
        </p>
      )}
      <CheckHistory benchId={benchId} />
    </section>
  );
}

function StartForm({ benchId, onStarted }: { benchId: string; onStarted: (id: number) => void }) {
  const start = useStartCheck(benchId);
  const form = useForm<z.input<typeof startFormSchema>, unknown, z.output<typeof startFormSchema>>({
    resolver: zodResolver(startFormSchema),
    defaultValues: { kind: 'routine', referenceG: '' },
  });
  return (
    <form
      noValidate
      className="space-y-5 rounded-xl bg-panel p-5"
      onSubmit={form.handleSubmit((values) =>
        start.mutate(values, { onSuccess: (answer) => onStarted(answer.id) }),
      )}
    >
      <fieldset className="space-y-2">
        <legend className="text-xl font-semibold">Which check</legend>
        <label className="flex min-h-12 items-center gap-3 text-xl">
          <input type="radio" value="routine" className="size-6" {...form.register('kind')} />
          Routine check: one placement, read against the weight&apos;s mass
        </label>
        <label className="flex min-h-12 items-center gap-3 text-xl">
          <input type="radio" value="repeatability" className="size-6" {...form.register('kind')} />
          Repeatability test: ten placements of the same weight
        </label>
      </fieldset>
      <Field
        label="Reference weight"
        unit="g"
        size="bench"
        hint="The mass marked on the weight (or on its certificate)."
        error={form.formState.errors.referenceG?.message}
      >
        {(control) => (
          <input
            inputMode="decimal"
            {...control}
            className={`${control.className} w-56`}
            {...form.register('referenceG')}
          />
        )}
      </Field>
      <p className="text-xl">
        Clear the pan before you start: the hub zeroes it, then tells you when to place the weight.
      </p>
      <button type="submit" className={button} disabled={start.isPending}>
        Start the check
      </button>
      {start.isError && (
        <p role="alert" className="text-xl font-semibold text-over">
          {start.error.message}
        </p>
      )}
    </form>
  );
}

/** What to do now, in big words. */
function stepWords(check: ScaleCheck): string {
  const weight = gramsText(check.referenceG, check.readabilityG);
  switch (check.step) {
    case 'zeroing':
      return 'Keep the pan clear: the hub is zeroing it';
    case 'place':
      return `Place the ${weight} weight on the pan`;
    case 'lift':
      return 'Lift the weight off the pan';
    default:
      return 'Reading…';
  }
}

function CheckInProgress({
  benchId,
  check,
  again,
  onAgain,
  mayCancel,
}: {
  benchId: string;
  check: ScaleCheck;
  again: boolean;
  onAgain: () => void;
  mayCancel: boolean;
}) {
  const cancel = useCancelCheck(benchId);
  const d = check.readabilityG;
  const repeatability = check.kind === 'repeatability';
  return (
    <div className="space-y-4 rounded-xl bg-panel p-5" aria-live="polite">
      {check.state === 'waiting' ? (
        <>
          <p className="text-4xl font-bold">{stepWords(check)}</p>
          {repeatability && (
            <p className="text-2xl">
              {check.readings.length} of {check.placementsNeeded} placements read
              {check.step === 'place' && check.readings.length > 0
                ? ': place it again, the same way'
                : ''}
            </p>
          )}
          <p className="text-xl text-muted">
            The hub takes the reading itself once the scale is steady: nothing to type.
          </p>
          {mayCancel && (
            <button
              type="button"
              className={button}
              disabled={cancel.isPending}
              onClick={() => cancel.mutate(check.id)}
            >
              Cancel the check
            </button>
          )}
        </>
      ) : (
        <CheckResult check={check} />
      )}
      {repeatability && check.readings.length > 0 && (
        <p className="text-lg tabular-nums">
          Readings: {check.readings.map((r) => gramsText(r, d)).join(', ')}
        </p>
      )}
      {cancel.isError && (
        <p role="alert" className="text-xl font-semibold text-over">
          {cancel.error.message}
        </p>
      )}
      {again && (
        <button type="button" className={button} onClick={onAgain}>
          Run another check
        </button>
      )}
    </div>
  );
}

function CheckResult({ check }: { check: ScaleCheck }) {
  const d = check.readabilityG;
  if (check.state === 'passed' && check.kind === 'routine') {
    return (
      <>
        <p className="text-4xl font-bold text-go">Passed</p>
        <p className="text-2xl">{outcomeText(check)}</p>
      </>
    );
  }
  if (check.state === 'failed') {
    return (
      <>
        <p className="text-4xl font-bold text-over">Failed</p>
        <p className="text-2xl">
          {`Read ${gramsText(check.readingG ?? 0, d)} for the ${gramsText(check.referenceG, d)} ` +
            `weight: error ${signedGrams(check.errorG ?? 0, d)}, more than the ` +
            `±${gramsText(check.toleranceG ?? 0, d)} allowed.`}
        </p>
        <p className="text-xl">
          Do not weigh on this scale until a lead has looked at it and a check passes.
        </p>
      </>
    );
  }
  if (check.state === 'passed') {
    return (
      <>
        <p className="text-4xl font-bold">Repeatability measured</p>
        <p className="text-2xl">
          s = {sdText(check.sdG ?? 0, d)}
          {check.sdUsedG !== null && check.sdG !== null && check.sdUsedG > check.sdG
            ? ` (taken as ${sdText(check.sdUsedG, d)}: never below 0.41 d)`
            : ''}
        </p>
        <p className="text-2xl">
          Smallest net mass this scale weighs within ±{check.bandPct} %:{' '}
          {gramsText(check.minNetG ?? 0, d)}
        </p>
      </>
    );
  }
  return (
    <>
      <p className="text-4xl font-bold">{check.state === 'cancelled' ? 'Cancelled' : 'Stopped'}</p>
      {check.note && <p className="text-2xl">{check.note}</p>}
    </>
  );
}
