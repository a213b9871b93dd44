import { groupListSchema } from '@common/contracts/varieties';
import { useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/groups: the caller's groups and their role in each (the register, new trials). */
export const getGroups = () => api('/api/groups', groupListSchema);

export const useGroups = (enabled = true) =>
  useQuery({ queryKey: trialKeys.groups(), queryFn: getGroups, enabled });
