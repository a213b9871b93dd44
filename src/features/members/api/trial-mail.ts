import { type MailStatus, trialMailResponse } from '@common/contracts/mail';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getTrialMail = (slug: string, status?: MailStatus) =>
  api(`/api/trials/${encodeURIComponent(slug)}/mail`, trialMailResponse, {
    query: status ? { status } : undefined,
  });

export const trialMailQueryOptions = (slug: string, status?: MailStatus) =>
  queryOptions({
    queryKey: trialKeys.mail(slug, { status }),
    queryFn: () => getTrialMail(slug, status),
    // While anything waits in the queue, look again now and then to show it leave.
    refetchInterval: (q) => ((q.state.data?.counts.pending ?? 0) > 0 ? 5000 : false),
  });

export const useTrialMail = (slug: string, status?: MailStatus) =>
  useQuery(trialMailQueryOptions(slug, status));
