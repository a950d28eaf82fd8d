import { z } from 'zod';

/** What a batch's material cost, from what the scale weighed of each part. */
export const batchCostSchema = z.object({
  /** Cost of each part as weighed, part A first, in the shop's currency. */
  parts: z.array(z.number()),
  total: z.number(),
});
export type BatchCost = z.infer<typeof batchCostSchema>;

/**
 * Cost of a batch: each part's weighed grams / 1000 × its cost per kg, summed. A part not
 * poured (yet) costs nothing. Null when the material has no cost per kg for every part weighed,
 * so a missing price never shows as a free batch.
 */
export function batchCost(
  weighedG: readonly (number | null)[],
  costPerKg: readonly number[] | undefined,
): BatchCost | null {
  if (!costPerKg || costPerKg.length < weighedG.length) return null;
  if (costPerKg.some((c) => !Number.isFinite(c) || c < 0)) return null;
  const parts = weighedG.map((g, i) => ((g ?? 0) / 1000) * costPerKg[i]!);
  return { parts, total: parts.reduce((a, b) => a + b, 0) };
}

/** A sum of money to the cent, for a table or a CSV column (half a cent rounds up). */
export function roundCents(amount: number): number {
  return Math.round((amount + Number.EPSILON) * 100) / 100;
}

/**
 * A material's price per kg of each part, when it records one. Read loosely on purpose: a record
 * stored before prices were kept has none, and a batch keeps the prices it started with.
 */
export function costPerKgOf(material: object): number[] | undefined {
  const value = (material as { costPerKg?: unknown }).costPerKg;
  return Array.isArray(value) && value.every((n) => typeof n === 'number' && Number.isFinite(n))
    ? (value as number[])
    : undefined;
}
