import { VolumeEstimator } from '../../features/plan/components/volume-estimator';

/** The volume estimator on its own page, open to anyone: it computes and stores nothing. */
export function PlanRoute() {
  return (
    <section aria-labelledby="plan-title" className="mx-auto max-w-7xl">
      <h1 id="plan-title" className="text-3xl font-bold">
        Volume estimator
      </h1>
      <p className="mt-2 mb-6 text-lg text-muted">
        How much to mix for a mold, and how much of each part to weigh. The plan updates as you
        type.
      </p>
      <VolumeEstimator />
    </section>
  );
}
