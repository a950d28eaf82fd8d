import type { ReactNode } from 'react';
import type { Batch, Material } from '@tareline/protocol';
import { mixedMassG, potLifeEndsAt } from '../../utils/pot-life';
import { CupLabel } from './cup-label';
import { deviationPctText } from '../../../../lib/percent';
import { MixingSteps } from './mixing-steps';
import { PotLifeCountdown } from './pot-life-countdown';
import { SafetyNotes } from './safety-notes';
import { VerdictMark } from './verdict-mark';

export interface SavedBatchProps {
  /** The way on (the next batch), shown in the banner so the step needs no extra row. */
  action?: ReactNode;
  /** The batch as the hub saved it (state `saved`). */
  batch: Batch;
  /** Its material, for pot life, part labels and cautions. */
  material: Material;
}

/**
 * What the bench shows once the hub has saved a batch: the verdict, the pot-life countdown, the
 * mixing steps, the printable cup label and the cautions.
 */
export function SavedBatch({ batch, material, action }: SavedBatchProps) {
  // The batch keeps the pot life it was mixed under; the material's is the fallback for a batch
  // saved before the hub copied it.
  const potLifeMin = batch.potLifeMin ?? material.potLifeMin ?? null;
  const potLifeMassG = batch.potLifeMassG ?? material.potLifeMassG ?? null;
  const endsAt =
    batch.savedAt && potLifeMin !== null ? potLifeEndsAt(batch.savedAt, potLifeMin) : null;
  const url = `${window.location.origin}/review/batches/${batch.id}`;

  // Three columns at the bench's 1280 × 800: the whole step shows without scrolling.
  return (
    <section aria-labelledby="saved-batch-title" className="space-y-3">
      <VerdictBanner batch={batch} action={action} />
      <div className="grid items-start gap-3 lg:grid-cols-[0.8fr_1.7fr_auto]">
        <div className="space-y-3">
          <PotLifeCountdown
            endsAt={endsAt}
            potLifeMin={potLifeMin}
            totalMassG={mixedMassG(batch)}
            potLifeMassG={potLifeMassG}
          />
          <SafetyNotes cautions={material.cautions} sdsRef={material.sdsRef} />
        </div>
        <MixingSteps partCount={batch.parts.length} verdict={batch.verdict} />
        <section aria-labelledby="label-title" className="space-y-3 rounded-xl bg-panel p-4">
          <div className="flex items-center justify-between gap-4">
            <h3 id="label-title" className="text-2xl font-bold">
              Cup label
            </h3>
            <button
              type="button"
              onClick={() => window.print()}
              className="min-h-14 rounded-lg bg-steel px-5 text-2xl font-bold text-paper"
            >
              Print label
            </button>
          </div>
          <CupLabel batch={batch} url={url} useBy={endsAt} />
        </section>
      </div>
    </section>
  );
}

/** The hub's verdict on the saved batch; with none (an older record), no verdict is shown. */
function VerdictBanner({ batch, action }: { batch: Batch; action?: ReactNode }) {
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
      className={`flex flex-wrap items-center gap-x-10 gap-y-2 rounded-xl px-6 py-2 text-paper ${batch.verdict ? shown.fill : 'bg-steel'}`}
      data-verdict={batch.verdict}
    >
      {batch.verdict && (
        <span className="text-5xl">
          <VerdictMark verdict={batch.verdict} className="h-12 w-12" />
        </span>
      )}
      <div>
        <h2 id="saved-batch-title" className="text-[2.25rem] leading-tight font-bold">
          Batch {batch.id} saved
        </h2>
        {batch.verdict && <p className="text-2xl font-medium">{shown.line}</p>}
      </div>
      {action && <div className="ml-auto">{action}</div>}
    </header>
  );
}
