import { useState } from 'react';
import { formatClock, formatCountdown } from '../../../lib/countdown';
import { secondsLeft } from '../utils/pot-life';
import { lastPoured } from '../utils/last-poured';
import { useNow } from './after-save/use-now';

/**
 * On the signed-out bench: the pot life still running on the last batch mixed here, so the cup
 * on the bench keeps its countdown whoever signs in next.
 */
export function PotLifeReminder({ benchId }: { benchId: string }) {
  const [entry] = useState(() => lastPoured(benchId, Date.now()));
  const endsAt = entry ? Date.parse(entry.endsAt) : 0;
  const now = useNow(endsAt, 1000);
  if (!entry || now >= endsAt) return null;
  return (
    <aside
      aria-label="Pot life running"
      className="mx-auto mt-8 max-w-3xl rounded-xl border-l-8 border-brass bg-panel px-6 py-4 text-xl"
    >
      Batch {entry.batchId}, {entry.materialName}: pot life{' '}
      <strong className="tabular-nums">
        {formatCountdown(secondsLeft(new Date(endsAt), now))}
      </strong>{' '}
      left, use by {formatClock(new Date(endsAt))}.
    </aside>
  );
}
