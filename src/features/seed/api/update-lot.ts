import type { UpdateLotBody } from '@common/contracts/seed';
import { api } from '@/lib/api-client';

/** PATCH /api/seed/lots/:lotId (group coordinators): only the fields sent change. */
export const updateLot = (lotId: string, body: UpdateLotBody) =>
  api(`/api/seed/lots/${lotId}`, null, { method: 'PATCH', body });
