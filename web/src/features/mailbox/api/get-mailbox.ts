import { mailboxMessageSchema, type MailboxMessage } from '@ratewarden/shared/flags';
import { queryOptions, useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';

export const mailboxKeys = {
  all: ['mailbox'] as const,
  list: () => [...mailboxKeys.all, 'list'] as const,
  message: (id: string) => [...mailboxKeys.all, 'message', id] as const,
};

const messageWithRawSchema = mailboxMessageSchema.extend({ raw: z.string() });

export function getMailbox(signal?: AbortSignal): Promise<MailboxMessage[]> {
  return api.get('/api/mailbox', z.array(mailboxMessageSchema), signal);
}

export const mailboxQueryOptions = () => queryOptions({ queryKey: mailboxKeys.list(), queryFn: ({ signal }) => getMailbox(signal), refetchInterval: 10_000 });

export function useMailbox() {
  return useSuspenseQuery(mailboxQueryOptions());
}

export function useMailboxMessage(id: string | null) {
  return useQuery({
    queryKey: mailboxKeys.message(id ?? ''),
    queryFn: ({ signal }) => api.get(`/api/mailbox/${encodeURIComponent(id!)}`, messageWithRawSchema, signal),
    enabled: id !== null,
    staleTime: Infinity,
  });
}
