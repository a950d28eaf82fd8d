import { Navigate, type RouteObject } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { DeskSignIn } from '../features/auth/components/desk-sign-in';
import { HubStatus } from '../features/health/components/hub-status';
import { RequireRole } from '../features/auth/components/require-role';
import {
  AlertsPage,
  AccuracyPage,
  BatchDetail,
  BatchesPage,
  BenchesOverview,
  BenchScaleRoute,
  MaterialsPage,
  MaterialDocumentsPage,
  CheckPage,
  PeoplePage,
  PlanEditorRoute,
  PlanPage,
  PlanRoute,
  PlansPage,
  ReviewRoute,
} from './lazy-pages';
import { BenchHomeRoute, BenchRoute } from './routes/bench';
import { NotFoundRoute } from './routes/not-found';

export const routes: RouteObject[] = [
  {
    element: <AppShell hubStatus={<HubStatus />} />,
    children: [
      { index: true, element: <Navigate to="/bench" replace /> },
      {
        path: 'bench',
        element: <BenchRoute />,
        children: [{ index: true, element: <BenchHomeRoute /> }],
      },
      { path: 'login', element: <DeskSignIn /> },
      {
        path: 'review',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <ReviewRoute />
          </RequireRole>
        ),
      },
      {
        path: 'review/batches',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <BatchesPage />
          </RequireRole>
        ),
      },
      {
        // Also what the QR code on a cup label opens: anyone signed in on the floor may look.
        path: 'review/batches/:batchId',
        element: (
          <RequireRole roles={['operator', 'lead', 'admin']}>
            <BatchDetail />
          </RequireRole>
        ),
      },
      {
        path: 'review/accuracy',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <AccuracyPage />
          </RequireRole>
        ),
      },
      {
        path: 'review/benches',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <BenchesOverview />
          </RequireRole>
        ),
      },
      {
        path: 'review/people',
        element: (
          <RequireRole roles={['admin']}>
            <PeoplePage />
          </RequireRole>
        ),
      },
      {
        path: 'materials',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <MaterialsPage />
          </RequireRole>
        ),
      },
      {
        path: 'alerts',
        element: (
          <RequireRole roles={['operator', 'lead', 'admin']}>
            <AlertsPage />
          </RequireRole>
        ),
      },
      { path: 'plan', element: <PlanRoute /> },
      {
        path: 'plans',
        element: (
          <RequireRole roles={['operator', 'lead', 'admin']}>
            <PlansPage />
          </RequireRole>
        ),
      },
      {
        path: 'plans/new',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <PlanEditorRoute />
          </RequireRole>
        ),
      },
      {
        path: 'plans/:planId',
        element: (
          <RequireRole roles={['operator', 'lead', 'admin']}>
            <PlanPage />
          </RequireRole>
        ),
      },
      {
        path: 'plans/:planId/edit',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <PlanEditorRoute />
          </RequireRole>
        ),
      },
      {
        // The material page links here: every version of its data sheets.
        path: 'materials/:materialId/documents',
        element: (
          <RequireRole roles={['operator', 'lead', 'admin']}>
            <MaterialDocumentsPage />
          </RequireRole>
        ),
      },
      {
        // Setting up and checking a scale is desk work for leads and admins.
        path: 'bench/:benchId/scale',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <BenchScaleRoute />
          </RequireRole>
        ),
      },
      {
        // Scale checks are run at the bench by a lead or the operator signed in there.
        path: 'bench/:benchId/checks',
        element: (
          <RequireRole roles={['operator', 'lead', 'admin']}>
            <CheckPage />
          </RequireRole>
        ),
      },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
];
