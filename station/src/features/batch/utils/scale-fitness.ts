import {
  batchFitness,
  type BatchFitness,
  type BenchSummary,
  type Material,
} from '@tareline/protocol';

/**
 * A bench as the amount step knows it. A measured repeatability is used where the bench carries
 * one (`repeatabilitySdG`); without it the fitness falls back to the readability (USP <41>).
 */
export type FitnessBench = Pick<BenchSummary, 'scale'> & { repeatabilitySdG?: number | null };

/**
 * Whether a planned total is within what the bench's scale weighs to the material's band; null
 * while there is no total or no scale to judge by. The arithmetic is protocol's `batchFitness`.
 */
export function benchFitness(
  material: Pick<Material, 'weightRatio' | 'tolerancePct'>,
  totalMassG: number | undefined,
  bench: FitnessBench | undefined,
): BatchFitness | null {
  if (!bench || totalMassG === undefined || !(totalMassG > 0) || !Number.isFinite(totalMassG)) {
    return null;
  }
  return batchFitness({
    weightRatio: material.weightRatio,
    totalMassG,
    tolerancePct: material.tolerancePct,
    readabilityG: bench.scale.readabilityG,
    repeatabilitySdG: bench.repeatabilitySdG ?? null,
  });
}
