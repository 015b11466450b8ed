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
          { path: 'intakes', lazy: () => import('./routes/intakes') },
          { path: 'intakes/:id', lazy: () => import('./routes/intake') },
          { path: 'overview', lazy: () => import('./routes/overview') },
          { path: 'trends', lazy: () => import('./routes/trends') },
          { path: 'comparison', lazy: () => import('./routes/comparison') },
          { path: 'adjusted', lazy: () => import('./routes/adjusted') },
          { path: 'sir', lazy: () => import('./routes/sir') },
          { path: 'flags', lazy: () => import('./routes/flags') },
          { path: 'flags/:id', lazy: () => import('./routes/flag') },
          { path: 'notices', lazy: () => import('./routes/notices') },
          { path: 'notices/:id', lazy: () => import('./routes/notice') },
          { path: 'rules', lazy: () => import('./routes/rules') },
          { path: 'rules/new', lazy: () => import('./routes/rule-new') },
          { path: 'rules/:id', lazy: () => import('./routes/rule') },
          { path: 'runs', lazy: () => import('./routes/runs') },
          { path: 'runs/unattributed', lazy: () => import('./routes/unattributed') },
          { path: 'cases', lazy: () => import('./routes/cases') },
          { path: 'cases/:ref', lazy: () => import('./routes/case') },
          { path: 'periods', lazy: () => import('./routes/periods') },
          { path: 'hearing', lazy: () => import('./routes/hearing-workers') },
          { path: 'hearing/upload', lazy: () => import('./routes/audiogram-upload') },
          { path: 'hearing/workers/:workerKey', lazy: () => import('./routes/hearing-worker') },
          { path: 'groups', lazy: () => import('./routes/groups') },
          { path: 'outcomes', lazy: () => import('./routes/outcomes') },
          { path: 'admin', lazy: () => import('./routes/admin-people') },
          { path: 'admin/clients', lazy: () => import('./routes/admin-clients') },
          { path: 'admin/audit', lazy: () => import('./routes/admin-audit') },
          { path: 'mailbox', lazy: () => import('./routes/mailbox') },
          { path: 'settings', lazy: () => import('./routes/settings') },
          { path: 'sites', lazy: () => import('./routes/sites') },
          { path: 'first-run', lazy: () => import('./routes/first-run') },
          { path: '*', lazy: () => import('./routes/not-found') },
        ],
      },
    ],
  },
]);
