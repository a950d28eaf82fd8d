import type { Batch, Material } from '@tareline/protocol';
import { SavedBatch } from './after-save/saved-batch';
import { primaryButton } from './buttons';

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
  return (
    <div className="flex flex-col gap-6">
      {batch.state === 'saved' ? (
        <>
          <p
            role="status"
            className={`rounded-2xl px-6 py-4 text-3xl font-bold ${batch.verdict === 'GO' ? 'bg-go text-paper' : 'bg-over text-paper'}`}
          >
            <span aria-hidden="true">{batch.verdict === 'GO' ? '✓ ' : '✕ '}</span>
            Saved on the hub as batch {batch.id}: {batch.verdict}
          </p>
          {material ? (
            <SavedBatch batch={batch} material={material} />
          ) : (
            <p className="text-xl text-muted">Loading the material…</p>
          )}
        </>
      ) : (
        <p
          role="status"
          className="rounded-2xl bg-panel px-6 py-4 text-3xl font-bold ring-1 ring-line"
        >
          Batch {batch.id} abandoned: {batch.abandonReason}
        </p>
      )}
      <div>
        <button type="button" onClick={onNext} className={primaryButton}>
          Next batch
        </button>
      </div>
    </div>
  );
}
