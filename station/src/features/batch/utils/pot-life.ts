import type { Batch } from '@tareline/protocol';

/** When a batch mixed at `savedAt` reaches the end of its pot life. */
export function potLifeEndsAt(savedAt: string, potLifeMin: number): Date {
  return new Date(Date.parse(savedAt) + potLifeMin * 60_000);
}

/** Whole seconds left until `useBy` at `nowMs`, counted up so the last second still shows 0:01. */
export function secondsLeft(useBy: Date, nowMs: number): number {
  return Math.max(0, Math.ceil((useBy.getTime() - nowMs) / 1000));
}

/**
 * Whether the batch is heavier than the mass its pot life was rated at. A data sheet's pot life
 * holds for that mass; a larger one heats itself faster (exotherm) and gels sooner. Unknown rating
 * mass: no claim either way.
 */
export function heavierThanRated(totalMassG: number, potLifeMassG: number | null): boolean {
  return potLifeMassG !== null && totalMassG > potLifeMassG;
}

/**
 * What is in the cup: the parts as weighed (rescue top-ups included), or the planned total
 * before anything was weighed. The heat a batch builds follows the mass actually mixed.
 */
export function mixedMassG(batch: Pick<Batch, 'parts' | 'totalMassG'>): number {
  const weighed = batch.parts.filter((p) => p.actualG !== null);
  if (weighed.length === 0) return batch.totalMassG;
  return weighed.reduce((sum, p) => sum + p.actualG!, 0);
}
