export const memberKeys = {
  all: (slug: string) => ['members', slug] as const,
  list: (slug: string) => [...memberKeys.all(slug), 'list'] as const,
  invitations: (slug: string) => [...memberKeys.all(slug), 'invitations'] as const,
};
