import { mailboxMessageSchema, type MailboxMessage } from '@ratewarden/shared/flags';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';

export const mailboxKeys = {
  all: ['mailbox'] as const,
  list: () => [...mailboxKeys.all, 'list'] as const,
};

export function getMailbox(signal?: AbortSignal): Promise<MailboxMessage[]> {
  return api.get('/api/mailbox', z.array(mailboxMessageSchema), signal);
}

export const mailboxQueryOptions = () => queryOptions({ queryKey: mailboxKeys.list(), queryFn: ({ signal }) => getMailbox(signal), refetchInterval: 10_000 });

export function useMailbox() {
  return useSuspenseQuery(mailboxQueryOptions());
}
