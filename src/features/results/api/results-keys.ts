export const resultsKeys = {
  all: ['results'] as const,
  public: (slug: string) => [...resultsKeys.all, 'public', slug] as const,
  version: (slug: string, version: number | 'latest') =>
    [...resultsKeys.public(slug), 'version', version] as const,
  versions: (slug: string) => [...resultsKeys.public(slug), 'versions'] as const,
  draft: (slug: string) => [...resultsKeys.all, 'draft', slug] as const,
  preview: (slug: string) => [...resultsKeys.draft(slug), 'preview'] as const,
};
