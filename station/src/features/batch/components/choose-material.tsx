import type { Material, PourPlan } from '@tareline/protocol';
import { usePourPlans } from '../../../lib/pour-plans';
import { useMaterials } from '../api/get-materials';
import { potLifeText, ratioText } from '../utils/describe';
import { HubError } from './hub-error';

const card =
  'flex min-h-32 w-full flex-col items-start gap-2 rounded-2xl bg-panel p-6 text-left shadow-sm ring-2 ring-line focus:ring-steel';

/** Step 1: big cards, the saved pour plans first (a mold poured again), then each material. */
export function ChooseMaterial({
  onChoose,
  onChoosePlan,
}: {
  onChoose: (material: Material) => void;
  onChoosePlan: (plan: PourPlan, material: Material) => void;
}) {
  const materials = useMaterials();
  const plans = usePourPlans();
  if (materials.isPending) return <p className="text-xl text-muted">Loading the materials…</p>;
  if (materials.error) return <HubError error={materials.error} what="No materials" />;
  const active = materials.data.filter((m) => m.active);
  if (active.length === 0) {
    return <p className="text-xl">No materials are in use yet: ask a lead to add one.</p>;
  }
  const byId = new Map(active.map((m) => [m.id, m]));
  // A plan of a retired material cannot be poured; it stays on the plans page.
  const pourable = (plans.data ?? []).filter((p) => byId.has(p.materialId));
  return (
    <div className="flex flex-col gap-6">
      {pourable.length > 0 && (
        <section aria-labelledby="plans-title" className="flex flex-col gap-3">
          <h3 id="plans-title" className="text-2xl font-bold">
            Pour plans
          </h3>
          <ul aria-label="Pour plans" className="grid gap-4 md:grid-cols-2">
            {pourable.map((p) => (
              <li key={p.id}>
                <button
                  type="button"
                  onClick={() => onChoosePlan(p, byId.get(p.materialId)!)}
                  className={card}
                >
                  <span className="text-2xl font-bold">{p.name}</span>
                  <span className="text-xl">
                    {p.materialName} · {p.totalMassG.toFixed(1)} g
                  </span>
                  <span className="text-lg text-muted">
                    {p.moldRef ? `Mold ${p.moldRef}` : 'Saved pour plan'}
                    {p.materialChanged && ' · total updated: the material changed'}
                  </span>
                </button>
              </li>
            ))}
          </ul>
        </section>
      )}
      <HubError error={plans.error} what="The pour plans could not be read" />
      <section aria-labelledby="materials-title" className="flex flex-col gap-3">
        {pourable.length > 0 && (
          <h3 id="materials-title" className="text-2xl font-bold">
            Materials
          </h3>
        )}
        <ul aria-label="Materials" className="grid gap-4 md:grid-cols-2">
          {active.map((m) => {
            const potLife = potLifeText(m);
            return (
              <li key={m.id}>
                <button type="button" onClick={() => onChoose(m)} className={card}>
                  <span className="text-2xl font-bold">{m.name}</span>
                  <span className="text-xl">Mix ratio {ratioText(m)}</span>
                  <span className="text-lg text-muted">
                    {potLife ? `Pot life ${potLife}` : 'No pot life given'} · tolerance ±{' '}
                    {m.tolerancePct} %
                  </span>
                </button>
              </li>
            );
          })}
        </ul>
      </section>
    </div>
  );
}
