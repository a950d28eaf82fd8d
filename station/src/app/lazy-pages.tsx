import { lazy } from 'react';

// Pages the bench screen does not show load on demand: an operator's screen downloads the bench
// flow and nothing else. Each `import()` here is a chunk of its own in the build.

export const BatchesPage = lazy(() =>
  import('../features/review/components/batches-page').then((m) => ({ default: m.BatchesPage })),
);
export const BatchDetail = lazy(() =>
  import('../features/review/components/batch-detail').then((m) => ({ default: m.BatchDetail })),
);
export const AccuracyPage = lazy(() =>
  import('../features/review/components/accuracy-page').then((m) => ({
    default: m.AccuracyPage,
  })),
);
export const BenchesOverview = lazy(() =>
  import('../features/review/components/benches-overview').then((m) => ({
    default: m.BenchesOverview,
  })),
);
export const ReviewRoute = lazy(() =>
  import('./routes/review').then((m) => ({ default: m.ReviewRoute })),
);
export const PeoplePage = lazy(() =>
  import('../features/people/components/people-page').then((m) => ({ default: m.PeoplePage })),
);
export const PlanRoute = lazy(() =>
  import('./routes/plan').then((m) => ({ default: m.PlanRoute })),
);
export const BenchScaleRoute = lazy(() =>
  import('./routes/bench-scale').then((m) => ({ default: m.BenchScaleRoute })),
);
export const VolumeEstimator = lazy(() =>
  import('../features/plan/components/volume-estimator').then((m) => ({
    default: m.VolumeEstimator,
  })),
);
export const AlertsPage = lazy(() =>
  import('../features/alerts/components/alerts-page').then((m) => ({ default: m.AlertsPage })),
);
export const MaterialsPage = lazy(() =>
  import('../features/materials/components/materials-page').then((m) => ({
    default: m.MaterialsPage,
  })),
);
export const PlansPage = lazy(() =>
  import('../features/plans/components/plans-page').then((m) => ({ default: m.PlansPage })),
);
export const PlanPage = lazy(() =>
  import('../features/plans/components/plan-page').then((m) => ({ default: m.PlanPage })),
);
export const PlanEditorRoute = lazy(() =>
  import('./routes/plans').then((m) => ({ default: m.PlanEditorRoute })),
);
export const MaterialDocumentsPage = lazy(() =>
  import('../features/material-docs/components/material-documents-page').then((m) => ({
    default: m.MaterialDocumentsPage,
  })),
);
export const CheckPage = lazy(() =>
  import('../features/scale-checks/components/check-page').then((m) => ({
    default: m.CheckPage,
  })),
);
/** Shown at sign-in only when a check is due: not worth the bench's first paint. */
export const CheckNotice = lazy(() =>
  import('../features/scale-checks/components/check-notice').then((m) => ({
    default: m.CheckNotice,
  })),
);
export const CheckLink = lazy(() =>
  import('../features/scale-checks/components/check-notice').then((m) => ({
    default: m.CheckLink,
  })),
);
// A demo and training aid, folded below the bench flow: not needed for the first paint.
export const SimulatorPanel = lazy(() =>
  import('../features/simulator/components/simulator-panel').then((m) => ({
    default: m.SimulatorPanel,
  })),
);
