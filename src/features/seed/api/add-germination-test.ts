import { createdSchema, type GerminationTestBody } from '@common/contracts/seed';
import { api } from '@/lib/api-client';

/** POST /api/seed/lots/:lotId/tests (group coordinators). */
export const addGerminationTest = (lotId: string, body: GerminationTestBody) =>
  api(`/api/seed/lots/${lotId}/tests`, createdSchema, { method: 'POST', body });
