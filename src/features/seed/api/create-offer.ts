import { createdSchema, type CreateOfferBody } from '@common/contracts/seed';
import { api } from '@/lib/api-client';

/** POST /api/varieties/:slug/seed/offers (group coordinators). */
export const createOffer = (varietySlug: string, body: CreateOfferBody) =>
  api(`/api/varieties/${encodeURIComponent(varietySlug)}/seed/offers`, createdSchema, {
    method: 'POST',
    body,
  });
