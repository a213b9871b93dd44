import type { AnalysisBasis } from '@common/contracts/analysis';

export const analysisKeys = {
  all: ['analysis'] as const,
  trial: (slug: string) => [...analysisKeys.all, 'trial', slug] as const,
  trait: (
    slug: string,
    q: { trait: string; basis: AnalysisBasis; alpha: number; letters: 'hsd' | 'lsd' },
  ) => [...analysisKeys.trial(slug), 'trait', q] as const,
  ranking: (slug: string, q: { traits: string[]; weights: number[]; alpha: number }) =>
    [...analysisKeys.trial(slug), 'ranking', q] as const,
  season: (slug: string) => [...analysisKeys.trial(slug), 'season'] as const,
  weather: (slug: string, siteId: string) =>
    [...analysisKeys.trial(slug), 'weather', siteId] as const,
};
