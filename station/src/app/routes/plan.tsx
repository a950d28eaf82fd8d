import type { PlanRequest } from '@tareline/protocol';
import { useCallback, useState } from 'react';
import { Link } from 'react-router-dom';
import { VolumeEstimator } from '../../features/plan/components/volume-estimator';
import { hasRole, useSession } from '../../lib/auth';

/** The volume estimator on its own page, open to anyone: it computes and stores nothing. */
export function PlanRoute() {
  const mayKeep = hasRole(useSession(), ['lead', 'admin']);
  const [request, setRequest] = useState<PlanRequest | undefined>();
  const onRequest = useCallback((r: PlanRequest | undefined) => setRequest(r), []);
  return (
    <section aria-labelledby="plan-title" className="mx-auto max-w-7xl">
      <h1 id="plan-title" className="text-3xl font-bold">
        Volume estimator
      </h1>
      <p className="mt-2 mb-6 text-lg text-muted">
        How much to mix for a mold, and how much of each part to weigh. The plan updates as you
        type.
      </p>
      {mayKeep && (
        <p className="mb-6 text-lg">
          {/* The cavity and allowances go along; the pour plan names the mold and the material. */}
          <Link
            className="underline"
            to="/plans/new"
            state={
              request && {
                estimate: {
                  cavity: request.cavity,
                  displacement: request.displacement,
                  overagePct: request.overagePct,
                  cupLossG: request.cupLossG,
                },
              }
            }
          >
            Keep this as a pour plan for a mold
          </Link>
        </p>
      )}
      <VolumeEstimator onRequest={onRequest} />
    </section>
  );
}
