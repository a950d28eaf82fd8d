import type { AlertEvent, Batch } from '@tareline/protocol';

/** An interrupted batch is worth a mail only if nobody resumed it within this time. */
export const INTERRUPTED_GRACE_MS = 15 * 60_000;

/** One alert a batch change calls for. */
export interface BatchAlert {
  event: AlertEvent;
  /** Names the event once: the same change announced twice queues nothing new. */
  key: string;
  /** Not to be sent before this time (ms since epoch). */
  notBefore: number;
}

const LOT_ALERT_CODES = new Set(['LOT_EXPIRED', 'LOT_LONG_OPEN']);

/** What a batch, as just written, calls for. `now` stands in for a step time the batch lacks. */
export function alertsFor(batch: Batch, now: number): BatchAlert[] {
  const alerts: BatchAlert[] = [];
  if (batch.state === 'saved') {
    if (batch.verdict === 'NO-GO') {
      alerts.push({ event: 'batch.no-go', key: `batch:${batch.id}:no-go`, notBefore: now });
    }
    if (batch.lots.some((lot) => lot.warnings.some((w) => LOT_ALERT_CODES.has(w.code)))) {
      alerts.push({
        event: 'batch.lot-warning',
        key: `batch:${batch.id}:lot-warning`,
        notBefore: now,
      });
    }
  } else if (batch.state === 'abandoned') {
    alerts.push({ event: 'batch.abandoned', key: `batch:${batch.id}:abandoned`, notBefore: now });
  } else if (batch.state === 'interrupted') {
    // A batch can be interrupted more than once; each interruption is its own event.
    const since = latestInterruption(batch.steps) ?? now;
    alerts.push({
      event: 'batch.interrupted',
      key: `batch:${batch.id}:interrupted:${since}`,
      notBefore: since + INTERRUPTED_GRACE_MS,
    });
  }
  return alerts;
}

/** Time of the last interruption: steps `interrupted`, `interrupted.2`, `interrupted.3`… */
function latestInterruption(steps: Record<string, string>): number | null {
  let latest: number | null = null;
  for (const [name, iso] of Object.entries(steps)) {
    if (!/^interrupted(\.\d+)?$/.test(name)) continue;
    const t = Date.parse(iso);
    if (latest === null || t > latest) latest = t;
  }
  return latest;
}

/** Retry waits after the 1st, 2nd, 3rd failure; hourly after that. */
const BACKOFF_MS = [60_000, 5 * 60_000, 30 * 60_000];
const HOURLY_MS = 60 * 60_000;
/** How long a mail keeps being retried before it is marked failed. */
export const GIVE_UP_AFTER_MS = 24 * 60 * 60_000;

/**
 * When to try again after `attempts` failed attempts, or null to give up: retried for a day
 * after its first attempt (1 min, 5 min, 30 min, then hourly).
 */
export function nextAttemptAfterFailure(
  attempts: number,
  firstAttemptAt: number,
  now: number,
): number | null {
  const wait = BACKOFF_MS[attempts - 1] ?? HOURLY_MS;
  const next = now + wait;
  return next - firstAttemptAt > GIVE_UP_AFTER_MS ? null : next;
}
