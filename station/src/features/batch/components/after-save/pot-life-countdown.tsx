import { formatClock, formatCountdown } from '../../../../lib/countdown';
import { gramsText } from '../../../../lib/grams';
import { heavierThanRated, secondsLeft } from '../../utils/pot-life';
import { useNow } from './use-now';

export interface PotLifeCountdownProps {
  /** When the pot life ends (the save plus the pot life), or null when none is on file. */
  endsAt: Date | null;
  potLifeMin: number | null;
  totalMassG: number;
  potLifeMassG: number | null;
}

/** Time left to pour, counted from the save, and what a heavy batch does to it. */
export function PotLifeCountdown({
  endsAt,
  potLifeMin,
  totalMassG,
  potLifeMassG,
}: PotLifeCountdownProps) {
  return (
    <section aria-labelledby="pot-life-title" className="space-y-1 rounded-xl bg-panel px-4 py-3">
      <h3 id="pot-life-title" className="text-2xl font-bold">
        Pot life
      </h3>
      {endsAt && potLifeMin !== null ? (
        <Countdown endsAt={endsAt} potLifeMin={potLifeMin} />
      ) : (
        <p className="text-2xl font-semibold">
          No pot life on file for this material. Check its data sheet and pour without delay.
        </p>
      )}
      {potLifeMassG !== null && heavierThanRated(totalMassG, potLifeMassG) && (
        <HeavyBatchCaution totalMassG={totalMassG} potLifeMassG={potLifeMassG} />
      )}
    </section>
  );
}

function Countdown({ endsAt, potLifeMin }: { endsAt: Date; potLifeMin: number }) {
  const now = useNow(endsAt.getTime());
  const left = secondsLeft(endsAt, now);
  if (left === 0) {
    return (
      <div role="alert" className="rounded-lg bg-over px-5 py-4 text-paper">
        <p className="text-5xl font-bold">Pot life over</p>
        <p className="mt-2 text-xl">
          The {potLifeMin} min ran out at {formatClock(endsAt)}. The material may already be
          gelling: do not pour it into a mold. Let it cure in the open before disposal, as its
          safety data sheet says.
        </p>
      </div>
    );
  }
  return (
    <div>
      <p
        role="timer"
        aria-label="Pot life left"
        className="text-[4rem] leading-none font-bold tabular-nums"
      >
        {formatCountdown(left)}
      </p>
      <p className="mt-1 text-xl">
        left of {potLifeMin} min · use by{' '}
        <span className="font-bold whitespace-nowrap">{formatClock(endsAt)}</span>
      </p>
    </div>
  );
}

function HeavyBatchCaution({
  totalMassG,
  potLifeMassG,
}: {
  totalMassG: number;
  potLifeMassG: number;
}) {
  return (
    <div
      role="note"
      aria-labelledby="heavy-batch-title"
      className="rounded-lg border-l-8 border-brass bg-paper px-5 py-4"
    >
      <p id="heavy-batch-title" className="text-xl font-bold">
        Heavier than the pot life was rated for
      </p>
      <p className="mt-1 text-lg">
        This batch is {gramsText(totalMassG, 0.1)}; the pot life on file is for{' '}
        {gramsText(potLifeMassG, 0.1)}. A larger mass builds heat faster and gels sooner (exotherm),
        so the real time may be shorter than the countdown. Pour promptly, use a wider container,
        and never leave a large mass standing in the cup.
      </p>
      <p className="mt-1 text-base text-muted">
        General guidance only: the material&apos;s data sheet comes first.
      </p>
    </div>
  );
}
