import { trialDetailKey } from '@/lib/trial';

export const trialKeys = {
  all: ['trials'] as const,
  list: () => [...trialKeys.all, 'list'] as const,
  detail: trialDetailKey,
};
