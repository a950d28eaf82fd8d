import { WEIGHING_STATES, type Material, type PourPlan } from '@tareline/protocol';
import { useState } from 'react';
import { useSession } from '../../../lib/auth';
import { useLiveBench } from '../../../hooks/use-live-bench';
import { usePourKeepsAwake } from '../hooks/use-pour-keeps-awake';
import { useCreateBatch } from '../api/create-batch';
import { useMaterials } from '../api/get-materials';
import { useBenchBatch } from '../hooks/use-bench-batch';
import { ratioText } from '../utils/describe';
import { AmountStep, type Estimator } from './amount-step';
import { secondaryButton } from './buttons';
import { ChooseMaterial } from './choose-material';
import { FinishedStep } from './finished-step';
import { HubError } from './hub-error';
import { LotsStep, type LotCodes } from './lots-step';
import { PrepStep } from './prep-step';
import { WeighStep } from './weigh-step';

const STEPS = [
  { key: 'material', title: 'Material' },
  { key: 'amount', title: 'Amount' },
  { key: 'lots', title: 'Lots' },
  { key: 'prep', title: 'Prepare' },
  { key: 'weigh', title: 'Weigh' },
  { key: 'saved', title: 'Saved' },
] as const;
type StepKey = (typeof STEPS)[number]['key'];
type DraftStep = Exclude<StepKey, 'weigh' | 'saved'>;

interface Draft {
  step: DraftStep;
  material?: Material;
  /** The pour plan chosen in step 1: its material and total, no amount step. */
  plan?: PourPlan;
  totalMassG?: number;
  lots: LotCodes;
}
const FRESH: Draft = { step: 'material', lots: {} };

/**
 * The guided flow at a signed-in bench: choose, amount, lots, prepare, then the hub's batch
 * (weighing, interrupted, saved) takes over. A reloaded screen picks up the open batch.
 */
export function BenchFlow({ benchId, estimator }: { benchId: string; estimator: Estimator }) {
  const session = useSession();
  const live = useLiveBench(benchId, { token: session?.token });
  const bench = useBenchBatch(benchId, live.batchEvent?.batch);
  const materials = useMaterials();
  const [draft, setDraft] = useState<Draft>(FRESH);
  const create = useCreateBatch({ onSuccess: bench.offer });
  const batch = bench.batch;
  usePourKeepsAwake(
    live.reading,
    batch?.readabilityG ?? 0.01,
    !!batch && (WEIGHING_STATES as readonly string[]).includes(batch.state),
  );

  const step: StepKey = !batch
    ? draft.step
    : batch.state === 'saved' || batch.state === 'abandoned'
      ? 'saved'
      : 'weigh';
  const material = batch ? materials.data?.find((m) => m.id === batch.materialId) : draft.material;
  const title = STEPS.find((s) => s.key === step)!.title;
  const goTo = (to: DraftStep) => setDraft((d) => ({ ...d, step: to }));

  const back: Partial<Record<StepKey, DraftStep>> = {
    amount: 'material',
    lots: 'amount',
    prep: 'lots',
  };
  const backTo = batch ? undefined : step === 'lots' && draft.plan ? 'material' : back[step];

  let body;
  if (live.refused) {
    body = <HubError error={new Error(live.refused)} what="The hub refused this screen" />;
  } else if (bench.loading) {
    body = <p className="text-xl text-muted">Asking the hub for this bench&apos;s batch…</p>;
  } else if (batch && step === 'saved') {
    body = (
      <FinishedStep
        batch={batch}
        material={material}
        onNext={() => {
          bench.dismiss();
          create.reset();
          setDraft(FRESH);
        }}
      />
    );
  } else if (batch) {
    // A new pour starts clean: a refusal shown for the last one is no longer news.
    const pourKey = `${batch.id}:${batch.state}:${batch.active?.part}:${batch.active?.kind}`;
    body = <WeighStep key={pourKey} batch={batch} live={live} onAnswer={bench.offer} />;
  } else if (step === 'material' || !draft.material) {
    body = (
      <ChooseMaterial
        onChoose={(m) =>
          setDraft((d) => ({
            step: 'amount',
            material: m,
            lots: m.id === d.material?.id ? d.lots : {},
          }))
        }
        onChoosePlan={(plan, m) =>
          setDraft((d) => ({
            step: 'lots',
            material: m,
            plan,
            totalMassG: plan.totalMassG,
            lots: m.id === d.material?.id ? d.lots : {},
          }))
        }
      />
    );
  } else if (step === 'amount') {
    body = (
      <AmountStep
        benchId={benchId}
        material={draft.material}
        initialG={draft.totalMassG}
        estimator={estimator}
        onDone={(totalMassG) =>
          setDraft(({ plan: _plan, ...d }) => ({ ...d, step: 'lots', totalMassG }))
        }
      />
    );
  } else if (step === 'lots') {
    body = (
      <LotsStep
        material={draft.material}
        totalMassG={draft.totalMassG}
        codes={draft.lots}
        onChange={(lots) => setDraft((d) => ({ ...d, lots }))}
        onDone={() => goTo('prep')}
      />
    );
  } else {
    const chosen = draft.material;
    body = (
      <PrepStep
        material={chosen}
        starting={create.isPending}
        startError={create.error}
        onStart={(override) => {
          const lots = Object.entries(draft.lots)
            .filter(([, code]) => code.trim() !== '')
            .map(([part, code]) => ({ part: Number(part), code: code.trim() }));
          // From a plan the hub takes the plan's total, recomputed if the material changed.
          create.mutate({
            ...(draft.plan
              ? { benchId, planId: draft.plan.id, lots }
              : { benchId, materialId: chosen.id, totalMassG: draft.totalMassG ?? 0, lots }),
            ...(override ? { override } : {}),
          });
        }}
      />
    );
  }

  return (
    <div className="flex flex-col gap-5">
      <h2 className="sr-only">{title}</h2>
      <div className="flex flex-wrap items-center justify-between gap-x-6 gap-y-2">
        <ol aria-label="Steps" className="flex flex-wrap gap-2 text-base">
          {STEPS.map((s, i) => (
            <li
              key={s.key}
              aria-current={s.key === step ? 'step' : undefined}
              className={`rounded-full px-3 py-1 ${s.key === step ? 'bg-steel font-bold text-paper' : 'bg-panel text-muted ring-1 ring-line'}`}
            >
              {i + 1}. {s.title}
            </li>
          ))}
        </ol>
        {material && (
          <p className="text-xl">
            {!batch && draft.plan && <>{draft.plan.name} · </>}
            <strong>{material.name}</strong> · {ratioText(material)}
            {(batch?.totalMassG ?? draft.totalMassG) !== undefined &&
              ` · ${batch?.totalMassG ?? draft.totalMassG} g`}
            {batch && ` · batch ${batch.id}`}
          </p>
        )}
      </div>
      <HubError error={bench.loadError} what="The bench's open batch could not be read" />
      {body}
      {backTo && (
        <div>
          <button type="button" onClick={() => goTo(backTo)} className={secondaryButton}>
            Back
          </button>
        </div>
      )}
    </div>
  );
}
