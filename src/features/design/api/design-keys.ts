export const designKeys = {
  all: ['design'] as const,
  detail: (slug: string) => [...designKeys.all, slug] as const,
};
