export const designKeys = {
  all: ['design'] as const,
  detail: (slug: string) => [...designKeys.all, slug] as const,
};

/**
 * The trials feature's queries show counts and names from the design (same keys as its key
 * factory); they are refreshed after a design change.
 */
export const trialQueryKeys = {
  list: ['trials', 'list'] as const,
  detail: (slug: string) => ['trials', 'detail', slug] as const,
};
