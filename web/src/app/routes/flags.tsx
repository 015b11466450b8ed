import { flagStateSchema } from '@ratewarden/shared/flags';
import type { LoaderFunctionArgs } from 'react-router';
import { flagsQueryOptions } from '../../api/get-flags';
import { FlagsPage } from '../../features/flags/flags-page';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader({ request }: LoaderFunctionArgs) {
  return prefetchFor(
    'flags:read',
    outcomesQueryOptions(),
    flagsQueryOptions({
      state: flagStateSchema.safeParse(new URL(request.url).searchParams.get('state')).data,
      outcomeId: Number(new URL(request.url).searchParams.get('outcome')) || undefined,
    }),
  );
}

export function Component() {
  return <RequirePermission permission="flags:read">{() => <FlagsPage />}</RequirePermission>;
}
