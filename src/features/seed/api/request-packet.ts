import { createdSchema, type SeedRequestBody } from '@common/contracts/seed';
import { api } from '@/lib/api-client';

/** POST /api/seed/offers/:offerId/requests: one packet for the caller. */
export const requestPacket = (offerId: string, body: SeedRequestBody) =>
  api(`/api/seed/offers/${offerId}/requests`, createdSchema, { method: 'POST', body });
