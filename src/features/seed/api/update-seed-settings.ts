import type { z } from 'zod';
import type { seedSettingsBody } from '@common/contracts/seed';
import { api } from '@/lib/api-client';

/** PATCH /api/seed/groups/:groupId/settings (group coordinators). */
export const updateSeedSettings = (groupId: string, body: z.input<typeof seedSettingsBody>) =>
  api(`/api/seed/groups/${groupId}/settings`, null, { method: 'PATCH', body });
