export const trialKeys = {
  all: ['trials'] as const,
  list: () => [...trialKeys.all, 'list'] as const,
  detail: (slug: string) => [...trialKeys.all, 'detail', slug] as const,
};
