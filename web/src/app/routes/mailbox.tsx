import { mailboxQueryOptions } from '../../features/mailbox/api/get-mailbox';
import { MailboxPage } from '../../features/mailbox/mailbox-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('mailbox:read', mailboxQueryOptions());
}

export function Component() {
  return <RequirePermission permission="mailbox:read">{() => <MailboxPage />}</RequirePermission>;
}
