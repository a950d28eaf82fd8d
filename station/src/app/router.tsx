import { Navigate, type RouteObject } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { DeskSignIn } from '../features/auth/components/desk-sign-in';
import { PeoplePage } from '../features/auth/components/people-page';
import { RequireRole } from '../features/auth/components/require-role';
import { BenchHomeRoute, BenchRoute } from './routes/bench';
import { BenchScaleRoute } from './routes/bench-scale';
import { NotFoundRoute } from './routes/not-found';
import { PlanRoute } from './routes/plan';
import { ReviewRoute } from './routes/review';

export const routes: RouteObject[] = [
  {
    element: <AppShell />,
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
        path: 'review/people',
        element: (
          <RequireRole roles={['admin']}>
            <PeoplePage />
          </RequireRole>
        ),
      },
      { path: 'plan', element: <PlanRoute /> },
      {
        // Setting up and checking a scale is desk work for leads and admins.
        path: 'bench/:benchId/scale',
        element: (
          <RequireRole roles={['lead', 'admin']}>
            <BenchScaleRoute />
          </RequireRole>
        ),
      },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
];
