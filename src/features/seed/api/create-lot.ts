import { createdSchema, type CreateLotBody } from '@common/contracts/seed';
import { api } from '@/lib/api-client';

/** POST /api/varieties/:slug/seed/lots (group coordinators). */
export const createLot = (varietySlug: string, body: CreateLotBody) =>
  api(`/api/varieties/${encodeURIComponent(varietySlug)}/seed/lots`, createdSchema, {
    method: 'POST',
    body,
  });
