import type { Batch, Material } from '@tareline/protocol';
import { mixedMassG, potLifeEndsAt } from '../../utils/pot-life';
import { CupLabel } from './cup-label';
import { deviationPctText } from '../../../../lib/percent';
import { MixingSteps } from './mixing-steps';
import { PotLifeCountdown } from './pot-life-countdown';
import { SafetyNotes } from './safety-notes';
import { VerdictMark } from './verdict-mark';

export interface SavedBatchProps {
  /** The batch as the hub saved it (state `saved`). */
  batch: Batch;
  /** Its material, for pot life, part labels and cautions. */
  material: Material;
}

/**
 * What the bench shows once the hub has saved a batch: the verdict, the pot-life countdown, the
 * mixing steps, the printable cup label and the cautions.
 */
export function SavedBatch({ batch, material }: SavedBatchProps) {
  // The batch keeps the pot life it was mixed under; the material's is the fallback for a batch
  // saved before the hub copied it.
  const potLifeMin = batch.potLifeMin ?? material.potLifeMin ?? null;
  const potLifeMassG = batch.potLifeMassG ?? material.potLifeMassG ?? null;
  const endsAt =
    batch.savedAt && potLifeMin !== null ? potLifeEndsAt(batch.savedAt, potLifeMin) : null;
  const url = `${window.location.origin}/review/batches/${batch.id}`;

  return (
    <section aria-labelledby="saved-batch-title" className="space-y-6">
      <VerdictBanner batch={batch} />
      <div className="grid gap-6 lg:grid-cols-2">
        <div className="space-y-6">
          <PotLifeCountdown
            endsAt={endsAt}
            potLifeMin={potLifeMin}
            totalMassG={mixedMassG(batch)}
            potLifeMassG={potLifeMassG}
          />
          <section aria-labelledby="label-title" className="space-y-4 rounded-xl bg-panel p-6">
            <h3 id="label-title" className="text-2xl font-bold">
              Cup label
            </h3>
            <div className="flex flex-wrap items-end gap-6">
              <CupLabel batch={batch} url={url} useBy={endsAt} />
              <button
                type="button"
                onClick={() => window.print()}
                className="min-h-14 rounded-lg bg-steel px-6 text-2xl font-bold text-paper"
              >
                Print label
              </button>
            </div>
          </section>
        </div>
        <MixingSteps partCount={batch.parts.length} verdict={batch.verdict} />
      </div>
      <SafetyNotes cautions={material.cautions} sdsRef={material.sdsRef} />
    </section>
  );
}

/** The hub's verdict on the saved batch; with none (an older record), no verdict is shown. */
function VerdictBanner({ batch }: { batch: Batch }) {
  const band = `the ±${batch.tolerancePct} % band`;
  const ratio =
    batch.ratioDeviationPct === null ? '' : ` · ratio ${deviationPctText(batch.ratioDeviationPct)}`;
  const shown = {
    GO: { fill: 'bg-go', line: `Weighed within ${band}${ratio}` },
    'NO-GO': {
      fill: 'bg-over',
      line: `Outside ${band}${ratio}. Keep this cup apart: a lead decides what happens to it.`,
    },
  }[batch.verdict ?? 'GO'];
  return (
    <header
      className={`flex flex-wrap items-center gap-x-10 gap-y-2 rounded-xl px-8 py-5 text-paper ${batch.verdict ? shown.fill : 'bg-steel'}`}
      data-verdict={batch.verdict}
    >
      {batch.verdict && (
        <span className="text-6xl">
          <VerdictMark verdict={batch.verdict} className="h-16 w-16" />
        </span>
      )}
      <div>
        <h2 id="saved-batch-title" className="text-4xl font-bold">
          Batch {batch.id} saved
        </h2>
        {batch.verdict && <p className="text-2xl font-medium">{shown.line}</p>}
      </div>
    </header>
  );
}
