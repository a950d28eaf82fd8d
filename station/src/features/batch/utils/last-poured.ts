import type { Batch } from '@tareline/protocol';
import { z } from 'zod';
import { potLifeEndsAt } from './pot-life';

/**
 * The bench's last saved batch while its pot life runs: the cup is still on the bench after an
 * idle sign-out or a switch of person, and its countdown must not vanish with the person. Holds
 * nothing about who mixed it.
 */
const lastPouredSchema = z.object({
  batchId: z.number(),
  materialName: z.string(),
  endsAt: z.string(),
});
export type LastPoured = z.infer<typeof lastPouredSchema>;

const keyOf = (benchId: string) => `tareline.lastPoured.${benchId}`;

export function rememberLastPoured(benchId: string, batch: Batch): void {
  if (batch.state !== 'saved' || !batch.savedAt || batch.potLifeMin === null) return;
  const entry: LastPoured = {
    batchId: batch.id,
    materialName: batch.materialName,
    endsAt: potLifeEndsAt(batch.savedAt, batch.potLifeMin).toISOString(),
  };
  try {
    localStorage.setItem(keyOf(benchId), JSON.stringify(entry));
  } catch {
    // No storage: the reminder is a convenience; the batch itself is on the hub.
  }
}

/** The bench's last batch whose pot life has not run out at `nowMs`, if any. */
export function lastPoured(benchId: string, nowMs: number): LastPoured | null {
  try {
    const parsed = lastPouredSchema.safeParse(
      JSON.parse(localStorage.getItem(keyOf(benchId)) ?? 'null'),
    );
    if (!parsed.success || Date.parse(parsed.data.endsAt) <= nowMs) return null;
    return parsed.data;
  } catch {
    return null;
  }
}
