import type { ListPhotosQuery } from '@common/contracts/photos';

export const photoKeys = {
  all: (slug: string) => ['photos', slug] as const,
  lists: (slug: string) => [...photoKeys.all(slug), 'list'] as const,
  list: (slug: string, filters: ListPhotosQuery) => [...photoKeys.lists(slug), filters] as const,
  tagging: (slug: string) => [...photoKeys.all(slug), 'tagging'] as const,
};
