import { Link } from 'react-router-dom';
import { hasRole, useSession } from '../../../lib/auth';
import { usePourPlans } from '../../../lib/pour-plans';

/** Every saved pour plan: the molds and parts the shop pours again. */
export function PlansPage() {
  const plans = usePourPlans();
  const mayEdit = hasRole(useSession(), ['lead', 'admin']);
  return (
    <section aria-labelledby="plans-title" className="mx-auto max-w-5xl">
      <div className="flex flex-wrap items-center justify-between gap-4">
        <h1 id="plans-title" className="text-3xl font-bold">
          Pour plans
        </h1>
        {mayEdit && (
          <Link to="/plans/new" className="rounded-lg bg-steel px-5 py-3 text-lg text-paper">
            New pour plan
          </Link>
        )}
      </div>
      <p className="mt-2 mb-6 text-lg text-muted">
        A mold measured once: its cavity and allowances, the material, and the total to mix. The
        bench offers them in step 1.
      </p>
      {plans.isPending && <p className="text-lg text-muted">Loading the pour plans…</p>}
      {plans.error && <p role="alert">The pour plans cannot be shown: {plans.error.message}</p>}
      {plans.data?.length === 0 && <p className="text-lg">No pour plan is saved yet.</p>}
      {plans.data && plans.data.length > 0 && (
        <table className="w-full text-left text-lg">
          <thead>
            <tr className="border-b-2 border-line">
              <th className="py-2">Mold or part</th>
              <th>Mold</th>
              <th>Material</th>
              <th className="text-right">Total</th>
            </tr>
          </thead>
          <tbody>
            {plans.data.map((p) => (
              <tr key={p.id} className="border-b border-line">
                <td className="py-2">
                  <Link className="underline" to={`/plans/${p.id}`}>
                    {p.name}
                  </Link>
                </td>
                <td>{p.moldRef ?? '—'}</td>
                <td>{p.materialName}</td>
                <td className="text-right tabular-nums">
                  {p.totalMassG.toFixed(1)} g
                  {p.materialChanged && (
                    <span className="block text-base text-muted">
                      was {p.savedTotalMassG.toFixed(1)} g: the material changed
                    </span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
