import type { AnswerSeedRequestBody } from '@common/contracts/seed';
import { api } from '@/lib/api-client';

/** PATCH /api/seed/requests/:requestId (group coordinators): sent or declined, mailed to them. */
export const answerSeedRequest = (requestId: string, body: AnswerSeedRequestBody) =>
  api(`/api/seed/requests/${requestId}`, null, { method: 'PATCH', body });
