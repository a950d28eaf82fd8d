import type { Batch, Material } from '@tareline/protocol';
import { lazy, Suspense, useEffect } from 'react';
import { rememberLastPoured } from '../utils/last-poured';
import { primaryButton } from './buttons';

// What follows a save (pot life, mixing steps, the cup label and its QR code library) is not
// needed for the bench's first paint: it loads while the operator pours.
const SavedBatch = lazy(() =>
  import('./after-save/saved-batch').then((m) => ({ default: m.SavedBatch })),
);

/**
 * Step 6: what the hub committed. Only ever shown for a batch the hub itself says is saved (or
 * abandoned): nothing is shown as saved that is not on its disk.
 */
export function FinishedStep({
  batch,
  material,
  onNext,
}: {
  batch: Batch;
  material: Material | undefined;
  onNext: () => void;
}) {
  // The cup outlives this screen: keep its pot life for the signed-out bench.
  useEffect(() => rememberLastPoured(batch.benchId, batch), [batch]);
  const next = (
    <button type="button" onClick={onNext} className={primaryButton}>
      Next batch
    </button>
  );
  if (batch.state === 'saved' && material) {
    // SavedBatch opens with the batch number, the hub's verdict and the way on.
    return (
      <Suspense
        fallback={
          <div className="flex items-center justify-between gap-4">
            <p role="status" className="text-3xl font-bold">
              Batch {batch.id} saved
            </p>
            {next}
          </div>
        }
      >
        <SavedBatch batch={batch} material={material} action={next} />
      </Suspense>
    );
  }
  return (
    <div className="flex flex-col gap-6">
      <div className="flex justify-end">{next}</div>
      {batch.state === 'saved' ? (
        <p role="status" className="text-3xl font-bold">
          Batch {batch.id} saved
        </p>
      ) : (
        <p
          role="status"
          className="rounded-2xl bg-panel px-6 py-4 text-3xl font-bold ring-1 ring-line"
        >
          Batch {batch.id} abandoned: {batch.abandonReason}
        </p>
      )}
    </div>
  );
}
