import { AudiogramUploadPage } from '../../features/hearing/audiogram-upload-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('intake:write');
}

export function Component() {
  return <RequirePermission permission="intake:write">{() => <AudiogramUploadPage />}</RequirePermission>;
}
