import { createBrowserRouter } from 'react-router';
import { PageLoading } from '../components/feedback/page-loading';
import { RouteError } from '../components/feedback/route-error';
import { PageFrame } from '../components/layout/page-frame';
import { HomePage } from '../features/home/home-page';

/**
 * Every page but the landing page is a lazy route module, so its code (and the statistics core
 * or the charts it needs) loads only when someone opens it.
 */
export const router = createBrowserRouter([
  {
    element: <PageFrame />,
    hydrateFallbackElement: <PageLoading />,
    children: [
      {
        errorElement: <RouteError />,
        children: [
          { index: true, element: <HomePage /> },
          { path: 'ad-hoc', lazy: () => import('./routes/ad-hoc') },
          { path: 'no-role', lazy: () => import('./routes/no-role') },
          { path: '*', lazy: () => import('./routes/not-found') },
        ],
      },
    ],
  },
]);
