import { Link, useParams } from 'react-router-dom';
import { hasRole, useSession } from '../../../lib/auth';
import { usePourPlan } from '../api/pour-plan';
import { cavityText } from '../utils/cavity-text';

const when = (iso: string) => new Date(iso).toLocaleString();

/** One pour plan: what it holds, and the batches poured from it. */
export function PlanPage() {
  const { planId } = useParams();
  const plan = usePourPlan(planId);
  const mayEdit = hasRole(useSession(), ['lead', 'admin']);
  if (plan.isPending) return <p className="text-lg text-muted">Loading the pour plan…</p>;
  if (plan.error) return <p role="alert">The pour plan cannot be shown: {plan.error.message}</p>;
  const p = plan.data;
  const e = p.estimate;
  return (
    <section aria-labelledby="plan-title" className="mx-auto max-w-5xl">
      <p className="text-lg">
        <Link className="underline" to="/plans">
          Pour plans
        </Link>
      </p>
      <div className="flex flex-wrap items-center justify-between gap-4">
        <h1 id="plan-title" className="text-3xl font-bold">
          {p.name}
        </h1>
        {mayEdit && (
          <Link
            to={`/plans/${p.id}/edit`}
            className="rounded-lg bg-steel px-5 py-3 text-lg text-paper"
          >
            Edit
          </Link>
        )}
      </div>
      <dl className="mt-4 grid gap-x-6 gap-y-2 text-lg sm:grid-cols-[max-content_1fr]">
        <dt className="font-semibold">Mold</dt>
        <dd>{p.moldRef ?? '—'}</dd>
        <dt className="font-semibold">Material</dt>
        <dd>{p.materialName}</dd>
        <dt className="font-semibold">Cavity</dt>
        <dd>{cavityText(e.cavity)}</dd>
        <dt className="font-semibold">Allowances</dt>
        <dd>
          {e.displacement ? `model ${e.displacement.volume} ${e.displacement.unit}, ` : ''}
          overage {e.overagePct} %, cup loss {e.cupLossG} g
        </dd>
        <dt className="font-semibold">Total to mix</dt>
        <dd>
          <strong className="tabular-nums">{p.totalMassG.toFixed(1)} g</strong>
          {p.materialChanged &&
            ` (saved as ${p.savedTotalMassG.toFixed(1)} g; the material has changed since)`}
        </dd>
        <dt className="font-semibold">Saved by</dt>
        <dd>
          {p.createdBy.name}, {when(p.createdAt)}
        </dd>
      </dl>
      <h2 className="mt-8 text-2xl font-bold">Batches poured from this plan</h2>
      {p.batches && p.batches.length > 0 ? (
        <ul aria-label="Batches from this plan" className="mt-3 space-y-2 text-lg">
          {p.batches.map((b) => (
            <li key={b.id}>
              <Link className="underline" to={`/review/batches/${b.id}`}>
                Batch {b.id}
              </Link>{' '}
              · {b.state}
              {b.verdict && ` ${b.verdict}`} · {b.totalMassG.toFixed(1)} g · {b.operatorName} ·{' '}
              {when(b.createdAt)}
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-3 text-lg">None yet.</p>
      )}
    </section>
  );
}
