import { VolumeEstimator } from '../../features/plan/components/volume-estimator';
import { PlanEditor } from '../../features/plans/components/plan-editor';

/** A pour plan made or edited with the planner's volume estimator, handed in here. */
export function PlanEditorRoute() {
  return <PlanEditor estimator={VolumeEstimator} />;
}
