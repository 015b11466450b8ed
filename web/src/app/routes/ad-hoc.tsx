import { AdHocPage } from '../../features/ad-hoc/ad-hoc-page';

export function Component() {
  return <AdHocPage />;
}
