/**
 * One invented variety as the client's pages receive it (the register's record and its seed
 * page), for client tests that draw those pages from answers already in the cache or a stub.
 */
import type { GerminationTest, SeedLot, VarietySeed } from '@common/contracts/seed';
import type { Variety } from '@common/contracts/varieties';

export const fixtureGroupId = '00000000-0000-4000-8000-0000000000e1';
export const fixtureLotId = '00000000-0000-4000-8000-0000000000d1';

export const brookRunner = (cover: Variety['cover'] = null): Variety => ({
  id: '00000000-0000-4000-8000-0000000000a1',
  slug: 'brook-runner',
  name: 'Brook Runner',
  crop: 'Pole bean',
  type: 'heirloom',
  origin: '',
  seedSource: '',
  description: '',
  expectedTraits: [],
  aliases: [],
  group: { id: fixtureGroupId, slug: 'fenwold-seed-circle', name: 'Fenwold seed circle' },
  cover,
});

/** Brook Runner's seed page for a coordinator: one lot with `tests`, and `offers`. */
export const brookRunnerSeed = (
  tests: GerminationTest[],
  offers: VarietySeed['offers'] = [],
  requestsOpen = false,
): VarietySeed => {
  const lot: SeedLot = {
    id: fixtureLotId,
    label: 'BR-26',
    source: 'own saving',
    harvestYear: 2026,
    amount: null,
    amountUnit: 'g',
    storagePlace: '',
    notes: '',
    tests,
    warnings: [],
    sown: [],
  };
  return {
    variety: { slug: 'brook-runner', name: 'Brook Runner', crop: 'Pole bean' },
    group: { id: fixtureGroupId, name: 'Fenwold seed circle' },
    canEdit: true,
    settings: { germinationThresholdPercent: 80, requestsOpen },
    lots: [lot],
    offers,
  };
};
