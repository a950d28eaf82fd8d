import type { Material } from '@tareline/protocol';
import { useMaterials } from '../api/get-materials';
import { potLifeText, ratioText } from '../utils/describe';
import { HubError } from './hub-error';

/** Step 1: big cards, one per material in use. */
export function ChooseMaterial({ onChoose }: { onChoose: (material: Material) => void }) {
  const materials = useMaterials();
  if (materials.isPending) return <p className="text-xl text-muted">Loading the materials…</p>;
  if (materials.error) return <HubError error={materials.error} what="No materials" />;
  const active = materials.data.filter((m) => m.active);
  if (active.length === 0) {
    return <p className="text-xl">No materials are in use yet: ask a lead to add one.</p>;
  }
  return (
    <ul aria-label="Materials" className="grid gap-4 md:grid-cols-2">
      {active.map((m) => {
        const potLife = potLifeText(m);
        return (
          <li key={m.id}>
            <button
              type="button"
              onClick={() => onChoose(m)}
              className="flex min-h-32 w-full flex-col items-start gap-2 rounded-2xl bg-panel p-6 text-left shadow-sm ring-2 ring-line focus:ring-steel"
            >
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
  );
}
