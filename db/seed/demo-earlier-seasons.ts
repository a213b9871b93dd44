/**
 * The demo's earlier seasons: the okra trial's first season (2025, five of this year's varieties
 * and one the library has since dropped) and a tomato trial of the same summer. With them the
 * register has varieties grown in two seasons, the cross-season table has something to set side
 * by side, and stability has more than three environments (trial × site). Everything is
 * invented, as in the rest of the demo. Pure data here; `seedEarlierSeasons` (seed.ts) writes it.
 */
import {
  type DemoEntry,
  type DemoSite,
  type DemoTrial,
  type DemoTrait,
  okraEntries,
  okraSites,
  okraTraits,
} from './demo-season';

/** Each earlier trial's own random seed (also its stored layout seed). */
export const EARLIER_SEASON_SEED = 20250505;

/** A cooler, wetter summer: the river flats did best and the schoolyard beds struggled. */
const sites2025: DemoSite[] = okraSites.map((s) => ({
  ...s,
  effect: { quarry: 0.93, millpond: 1.12, fennick: 0.7 }[s.key] ?? s.effect,
}));

const okra = (code: string) => okraEntries.find((e) => e.code === code)!;

const okraEntries2025: DemoEntry[] = [
  { ...okra('VL'), seedSource: 'Larkhaven Seed Library, lot 2023-08' },
  { ...okra('ML'), seedSource: 'Saved by a Mill Pond volunteer' },
  { ...okra('CD'), seedSource: 'Larkhaven Seed Library, lot 2023-11' },
  { ...okra('SR'), seedSource: 'Fennick school garden club' },
  { ...okra('RS'), seedSource: 'Larkhaven Seed Library, lot 2024-01' },
  {
    code: 'HP',
    name: 'Hollin Pink Velvet',
    seedSource: 'Donated at the autumn swap',
    entryType: 'heirloom',
    claimedDays: 63,
    notes: 'Pale pink pods; dropped from the shelf after this season.',
    yieldEffect: 0.8,
    podMassG: 13,
    heightMm: 1350,
    toughAtMm: 90,
    firstHarvestDay: 64,
    spines: 1.4,
    spacingMm: 450,
  },
];

const tomatoEntry = (
  code: string,
  name: string,
  entryType: DemoEntry['entryType'],
  seedSource: string,
  notes: string,
  figures: { yieldEffect: number; fruitG: number; heightMm: number; firstDay: number },
): DemoEntry => ({
  code,
  name,
  seedSource,
  entryType,
  claimedDays: figures.firstDay - 45,
  notes,
  yieldEffect: figures.yieldEffect,
  podMassG: figures.fruitG,
  heightMm: figures.heightMm,
  toughAtMm: 0,
  firstHarvestDay: figures.firstDay,
  spines: 0,
  spacingMm: 600,
});

const tomatoEntries: DemoEntry[] = [
  tomatoEntry(
    'WR',
    'Wickerbury Red',
    'heirloom',
    'Larkhaven Seed Library, lot 2024-02',
    'Round red slicer; cracks after heavy rain.',
    { yieldEffect: 1.0, fruitG: 150, heightMm: 1600, firstDay: 118 },
  ),
  tomatoEntry(
    'SG',
    'Saltmarsh Gold',
    'open_pollinated',
    'Swapped at the spring seed fair',
    'Yellow-orange, mild and low in acid.',
    { yieldEffect: 0.9, fruitG: 130, heightMm: 1500, firstDay: 122 },
  ),
  tomatoEntry(
    'HC',
    'Hollyhatch Cherry',
    'open_pollinated',
    'Fennick school garden club',
    'Small red fruit on long trusses.',
    { yieldEffect: 0.78, fruitG: 18, heightMm: 1900, firstDay: 108 },
  ),
  tomatoEntry(
    'PP',
    'Pennant Plum',
    'heirloom',
    'Saved by a Quarry Lane volunteer',
    'Paste type; dense flesh for sauce.',
    { yieldEffect: 1.12, fruitG: 85, heightMm: 1100, firstDay: 115 },
  ),
  tomatoEntry(
    'DM',
    'Duskmoor Purple',
    'heirloom',
    'Larkhaven Seed Library, lot 2022-06',
    'Dusky purple beefsteak; needs staking early.',
    { yieldEffect: 0.95, fruitG: 210, heightMm: 1700, firstDay: 126 },
  ),
];

const tomatoTraits: DemoTrait[] = [
  okraTraits.find((t) => t.key === 'marketable_yield')!,
  {
    key: 'fruit_count',
    label: 'Marketable fruit count',
    quantityKind: 'count',
    basis: 'harvest',
    direction: 'higher',
  },
  // Tall or short suits different supports, so neither is better.
  { ...okraTraits.find((t) => t.key === 'plant_height')!, direction: 'none' },
  okraTraits.find((t) => t.key === 'vigor')!,
];

const members: DemoTrial['members'] = [
  { account: 'lead', role: 'lead' },
  { account: 'grower', role: 'grower', siteKeys: ['quarry'] },
  { account: 'grower2', role: 'grower' },
  { account: 'viewer', role: 'viewer' },
];

export const earlierDemoTrials: DemoTrial[] = [
  {
    slug: 'larkhaven-okra-2025',
    title: 'Larkhaven heirloom okra, first season',
    crop: 'Okra',
    season: '2025',
    design: 'multisite',
    status: 'closed',
    description:
      'The first okra season: six varieties from the library shelf in three randomized blocks at the same three volunteer gardens, no fertilizer. A cool, wet summer.',
    sowingDate: '2025-05-06',
    transplantDate: '2025-05-27',
    seasonEnd: '2025-09-16',
    sites: sites2025,
    entries: okraEntries2025,
    traits: okraTraits,
    blocks: 3,
    rowLengthMm: 3000,
    rowSpacingMm: 900,
    fertilizer: { none: true },
    members,
  },
  {
    slug: 'larkhaven-tomatoes-2025',
    title: 'Larkhaven slicing and paste tomatoes',
    crop: 'Tomato',
    season: '2025',
    design: 'multisite',
    status: 'closed',
    description:
      'Five tomato varieties, staked, in three randomized blocks at the three volunteer gardens, to choose which to grow out for the seed shelf.',
    sowingDate: '2025-03-24',
    transplantDate: '2025-05-12',
    seasonEnd: '2025-09-26',
    sites: sites2025,
    entries: tomatoEntries,
    traits: tomatoTraits,
    blocks: 3,
    rowLengthMm: 3600,
    rowSpacingMm: 1200,
    fertilizer: { kind: 'Garden compost', rateGPerM2: 3000 },
    podsPerPlantPerRound: 0.7,
    members,
  },
];
