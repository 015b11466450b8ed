import { createBrowserRouter } from 'react-router';
import { PageFrame } from '../components/layout/page-frame';
import { HomePage } from '../features/home/home-page';

export const router = createBrowserRouter([
  {
    element: <PageFrame />,
    children: [{ index: true, element: <HomePage /> }],
  },
]);
