import type { Batch, Material } from '@tareline/protocol';

export interface SavedBatchProps {
  /** The batch as the hub saved it (state `saved`). */
  batch: Batch;
  /** Its material, for pot life, part labels and cautions. */
  material: Material;
}

/**
 * What the bench shows once the hub has saved a batch: the pot-life countdown, the mixing steps
 * and the printable cup label. First cut: the batch number and verdict.
 */
export function SavedBatch({ batch, material }: SavedBatchProps) {
  return (
    <section aria-labelledby="saved-batch-title" className="space-y-2">
      <h2 id="saved-batch-title" className="text-3xl font-bold">
        Batch {batch.id} saved
      </h2>
      <p className="text-xl">
        {material.name}: {batch.verdict}
      </p>
    </section>
  );
}
