import { api } from '@/lib/api-client';

/** PATCH /api/seed/offers/:offerId (group coordinators): no more requests. */
export const closeOffer = (offerId: string) =>
  api(`/api/seed/offers/${offerId}`, null, { method: 'PATCH', body: { status: 'closed' } });
