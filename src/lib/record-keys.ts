/**
 * Query keys of a trial's field records. Shared because the field log writes what the records
 * tables read: after a send, the field log invalidates these and the tables refresh.
 */
export const recordKeys = {
  all: (slug: string) => ['records', slug] as const,
  plots: (slug: string, siteId?: string) => ['records', slug, 'plots', siteId ?? 'all'] as const,
  harvests: (slug: string, filters: object = {}) => ['records', slug, 'harvests', filters] as const,
  observations: (slug: string, filters: object = {}) =>
    ['records', slug, 'observations', filters] as const,
  events: (slug: string, filters: object = {}) => ['records', slug, 'events', filters] as const,
  completeness: (slug: string, q: object) => ['records', slug, 'completeness', q] as const,
  audit: (slug: string, q: object = {}) => ['records', slug, 'audit', q] as const,
};
