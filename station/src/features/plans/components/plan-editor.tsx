import {
  planMaterialOf,
  pourEstimateSchema,
  pourPlanInputSchema,
  type PlanMaterial,
  type PlanRequest,
  type PourEstimateInput,
  type PourPlan,
} from '@tareline/protocol';
import { useCallback, useState, type ComponentType } from 'react';
import { Link, Navigate, useLocation, useParams } from 'react-router-dom';
import { SelectField, TextField } from '../../../components/form/field';
import { ApiRequestError } from '../../../lib/api-client';
import { usePlanMaterials, usePourPlan, useSavePourPlan } from '../api/pour-plan';

/** The volume estimator, handed in by the app (features do not import each other). */
export type PlanEstimator = ComponentType<{
  material: PlanMaterial;
  tolerancePct: number;
  onRequest: (request: PlanRequest | undefined) => void;
  initial?: PourEstimateInput;
}>;

/** `/plans/new` and `/plans/:planId/edit`: a mold's name, its material and the estimator. */
export function PlanEditor({ estimator }: { estimator: PlanEstimator }) {
  const { planId } = useParams();
  const existing = usePourPlan(planId);
  // From the planner page: the cavity and allowances typed there.
  const carried = pourEstimateSchema.safeParse(
    (useLocation().state as { estimate?: unknown } | null)?.estimate,
  );
  if (planId && existing.isPending) {
    return <p className="text-lg text-muted">Loading the pour plan…</p>;
  }
  if (planId && existing.error) {
    return <p role="alert">The pour plan cannot be shown: {existing.error.message}</p>;
  }
  return (
    <PlanForm
      key={planId ?? 'new'}
      plan={existing.data}
      estimator={estimator}
      {...(!planId && carried.success ? { initial: carried.data } : {})}
    />
  );
}

function PlanForm({
  plan,
  estimator: Estimator,
  initial,
}: {
  plan?: PourPlan | undefined;
  estimator: PlanEstimator;
  initial?: PourEstimateInput;
}) {
  const materials = usePlanMaterials();
  const save = useSavePourPlan(plan?.id);
  const [name, setName] = useState(plan?.name ?? '');
  const [moldRef, setMoldRef] = useState(plan?.moldRef ?? '');
  const [materialId, setMaterialId] = useState(plan?.materialId ?? '');
  const [request, setRequest] = useState<PlanRequest | undefined>();
  const onRequest = useCallback((r: PlanRequest | undefined) => setRequest(r), []);
  const material = materials.data?.find((m) => m.id === materialId);

  const estimate = request && {
    cavity: request.cavity,
    ...(request.displacement ? { displacement: request.displacement } : {}),
    overagePct: request.overagePct,
    cupLossG: request.cupLossG,
  };
  const body = { name, ...(moldRef.trim() ? { moldRef } : {}), materialId, estimate };
  const checked = pourPlanInputSchema.safeParse(body);
  const problems = checked.success ? [] : checked.error.issues.map((i) => i.message);
  const hubErrors = save.error instanceof ApiRequestError ? save.error.body.errors : [];
  if (save.data) return <Navigate to={`/plans/${save.data.id}`} replace />;

  return (
    <section aria-labelledby="plan-editor-title" className="mx-auto max-w-7xl">
      <p className="text-lg">
        <Link className="underline" to={plan ? `/plans/${plan.id}` : '/plans'}>
          {plan ? plan.name : 'Pour plans'}
        </Link>
      </p>
      <h1 id="plan-editor-title" className="text-3xl font-bold">
        {plan ? 'Edit the pour plan' : 'New pour plan'}
      </h1>
      <form
        aria-label="Pour plan"
        noValidate
        className="mt-4 grid gap-4 sm:grid-cols-3"
        onSubmit={(e) => {
          e.preventDefault();
          if (!checked.success) return;
          save.mutate(checked.data);
        }}
      >
        <TextField
          label="Mold or part"
          value={name}
          onChange={(e) => setName(e.target.value)}
          size="figure"
        />
        <TextField
          label="Mold reference"
          hint="The number or mark on the mold, if any."
          value={moldRef}
          onChange={(e) => setMoldRef(e.target.value)}
          size="figure"
        />
        <SelectField
          label="Material"
          value={materialId}
          onPick={setMaterialId}
          options={[
            { value: '', label: 'Choose…' },
            ...(materials.data ?? []).map((m) => ({ value: m.id, label: m.name })),
          ]}
        />
        <div className="flex flex-wrap items-center gap-4 sm:col-span-3">
          <button
            type="submit"
            disabled={!checked.success || save.isPending}
            className="min-h-14 rounded-xl bg-steel px-8 text-xl font-semibold text-paper disabled:bg-line disabled:text-muted"
          >
            {save.isPending ? 'Saving…' : 'Save the pour plan'}
          </button>
          {!checked.success && (
            <p className="text-lg text-muted">Still needed: {[...new Set(problems)].join('; ')}</p>
          )}
        </div>
        {save.error && (
          <div role="alert" className="text-lg font-semibold text-over sm:col-span-3">
            {save.error.message}
            {hubErrors.map((e) => (
              <p key={`${e.path}:${e.message}`}>{e.message}</p>
            ))}
          </div>
        )}
      </form>
      <div className="mt-6">
        {material ? (
          <Estimator
            key={material.id}
            material={planMaterialOf(material)}
            tolerancePct={material.tolerancePct}
            onRequest={onRequest}
            {...(plan ? { initial: plan.estimate } : initial ? { initial } : {})}
          />
        ) : (
          <p className="text-lg">Choose the material to size the pour.</p>
        )}
      </div>
    </section>
  );
}
