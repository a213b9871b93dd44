import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';

const messageSchema = z.object({
  id: z.number(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  links: z.array(z.string()),
});
const mailboxSchema = z.object({ messages: z.array(messageSchema) });
export type CapturedMessage = z.infer<typeof messageSchema>;

export const mailboxKeys = { all: ['dev-mailbox'] as const };

export const getMailbox = () => api('/api/dev/mailbox', mailboxSchema);

export const mailboxQueryOptions = () =>
  queryOptions({ queryKey: mailboxKeys.all, queryFn: getMailbox, refetchInterval: 3000 });

export const useMailbox = () => useQuery(mailboxQueryOptions());
