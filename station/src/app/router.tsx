import { Navigate, type RouteObject } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { BenchRoute } from './routes/bench';
import { BenchScaleRoute } from './routes/bench-scale';
import { NotFoundRoute } from './routes/not-found';
import { ReviewRoute } from './routes/review';

export const routes: RouteObject[] = [
  {
    element: <AppShell />,
    children: [
      { index: true, element: <Navigate to="/bench" replace /> },
      { path: 'bench', element: <BenchRoute /> },
      { path: 'bench/:benchId/scale', element: <BenchScaleRoute /> },
      { path: 'review', element: <ReviewRoute /> },
      { path: '*', element: <NotFoundRoute /> },
    ],
  },
];
