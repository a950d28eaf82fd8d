import { Navigate, type RouteObject } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { BenchRoute } from './routes/bench';
import { NotFoundRoute } from './routes/not-found';
import { PlanRoute } from './routes/plan';
import { ReviewRoute } from './routes/review';

export const routes: RouteObject[] = [
  {
    element: <AppShell />,
    children: [
      { index: true, element: <Navigate to="/bench" replace /> },
      { path: 'bench', element: <BenchRoute /> },
      { path: 'review', element: <ReviewRoute /> },
      { path: 'plan', element: <PlanRoute /> },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
];
