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
// A demo and training aid, folded below the bench flow: not needed for the first paint.
export const SimulatorPanel = lazy(() =>
  import('../features/simulator/components/simulator-panel').then((m) => ({
    default: m.SimulatorPanel,
  })),
);
