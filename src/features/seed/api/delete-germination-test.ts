import { api } from '@/lib/api-client';

/** DELETE /api/seed/lots/:lotId/tests/:testId (group coordinators). */
export const deleteGerminationTest = (lotId: string, testId: string) =>
  api(`/api/seed/lots/${lotId}/tests/${testId}`, null, { method: 'DELETE' });
