import { RequirePermission } from '../../features/access/require-permission';
import { settingsQueryOptions } from '../../api/get-settings';
import { SettingsPage } from '../../features/settings/settings-page';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('settings:read', settingsQueryOptions());
}

export function Component() {
  return <RequirePermission permission="settings:read">{(user) => <SettingsPage user={user} />}</RequirePermission>;
}
