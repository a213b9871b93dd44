/**
 * The demo season: an invented town seed library (Larkhaven Seed Library) whose volunteers
 * compare invented okra and bush bean varieties. Every person, place and variety is fictional.
 * Pure: the same seed gives the same season; db/seed/seed.ts writes it.
 */
import { addDays } from '../../common/calendar-date';
import { randomizeLayout } from '../../common/layout';
import { createRandom, type Random } from '../../common/random';

export const DEMO_SEED = 20260504;
/** Seed of the heat-tolerance scores, which have no variety effect by design. */
export const HEAT_SCORE_SEED = 7;

export const demoAccounts = [
  {
    key: 'lead',
    name: 'Marisol Quenby',
    email: 'marisol@larkhaven-seeds.example',
    password: 'lead-demo-pass',
    isAdmin: false,
  },
  {
    key: 'grower',
    name: 'Tobiah Wrenfield',
    email: 'tobiah@larkhaven-seeds.example',
    password: 'grower-demo-pass',
    isAdmin: false,
  },
  {
    key: 'grower2',
    name: 'Ada Pellwright',
    email: 'ada@larkhaven-seeds.example',
    password: 'grower-demo-pass',
    isAdmin: false,
  },
  {
    key: 'contributor',
    name: 'Jun Halloway',
    email: 'jun@larkhaven-seeds.example',
    password: 'contributor-demo-pass',
    isAdmin: false,
  },
  {
    key: 'viewer',
    name: 'Priya Stellmacher',
    email: 'priya@larkhaven-seeds.example',
    password: 'viewer-demo-pass',
    isAdmin: false,
  },
  {
    key: 'admin',
    name: 'Rowan Keeper',
    email: 'admin@rowtally.example',
    password: 'admin-demo-pass',
    isAdmin: true,
  },
] as const;
export type DemoAccountKey = (typeof demoAccounts)[number]['key'];

export interface DemoSite {
  key: string;
  name: string;
  region: string;
  soilTexture: string;
  irrigationMethod: 'drip' | 'overhead' | 'hand';
  notes: string;
  effect: number;
}
export interface DemoEntry {
  code: string;
  name: string;
  seedSource: string;
  entryType: 'heirloom' | 'open_pollinated' | 'hybrid';
  claimedDays: number;
  notes: string;
  yieldEffect: number;
  podMassG: number;
  heightMm: number;
  toughAtMm: number;
  firstHarvestDay: number;
  spines: number;
  spacingMm: number;
}
export interface DemoTrait {
  key: string;
  label: string;
  quantityKind: 'mass' | 'length' | 'count' | 'score' | 'percent';
  basis: 'plant' | 'plot' | 'harvest';
  direction: 'higher' | 'lower' | 'none';
  scaleMin?: number;
  scaleMax?: number;
}

export interface DemoTrial {
  slug: string;
  title: string;
  crop: string;
  season: string;
  design: 'crd' | 'rcbd' | 'multisite';
  status: 'active' | 'closed';
  /** Fruits or pods a plant gives per picking round (okra 1.1 and beans 4.5 when not set). */
  podsPerPlantPerRound?: number;
  description: string;
  sowingDate: string;
  transplantDate: string | null;
  seasonEnd: string;
  sites: DemoSite[];
  entries: DemoEntry[];
  traits: DemoTrait[];
  blocks: number;
  rowLengthMm: number;
  rowSpacingMm: number;
  fertilizer: { none: true } | { kind: string; rateGPerM2: number };
  members: {
    account: DemoAccountKey;
    role: 'lead' | 'grower' | 'contributor' | 'viewer';
    siteKeys?: string[];
  }[];
}

export const okraSites: DemoSite[] = [
  {
    key: 'quarry',
    name: 'Quarry Lane Allotment',
    region: 'Larkhaven, east side',
    soilTexture: 'sandy loam',
    irrigationMethod: 'drip',
    notes: 'Free-draining; drip tape on a timer.',
    effect: 1.15,
  },
  {
    key: 'millpond',
    name: 'Mill Pond Garden',
    region: 'Larkhaven, river flats',
    soilTexture: 'clay loam',
    irrigationMethod: 'overhead',
    notes: 'Heavy soil, slow to warm in spring.',
    effect: 1.0,
  },
  {
    key: 'fennick',
    name: 'Fennick Schoolyard Beds',
    region: 'Fennick village',
    soilTexture: 'silt loam',
    irrigationMethod: 'hand',
    notes: 'Raised beds, watered by hand by the school garden club.',
    effect: 0.82,
  },
];

export const okraEntries: DemoEntry[] = [
  {
    code: 'VL',
    name: 'Velvet Lantern',
    seedSource: 'Larkhaven Seed Library, lot 2024-07',
    entryType: 'heirloom',
    claimedDays: 58,
    notes: 'Smooth, nearly spineless pods.',
    yieldEffect: 1.0,
    podMassG: 14,
    heightMm: 1250,
    toughAtMm: 95,
    firstHarvestDay: 60,
    spines: 0.4,
    spacingMm: 450,
  },
  {
    code: 'ML',
    name: 'Mossbank Long',
    seedSource: 'Saved by a Mill Pond volunteer',
    entryType: 'heirloom',
    claimedDays: 62,
    notes: 'Long ridged pods that stay tender.',
    yieldEffect: 1.32,
    podMassG: 17,
    heightMm: 1600,
    toughAtMm: 140,
    firstHarvestDay: 63,
    spines: 1.6,
    spacingMm: 450,
  },
  {
    code: 'CD',
    name: 'Copperbell Dwarf',
    seedSource: 'Larkhaven Seed Library, lot 2023-11',
    entryType: 'heirloom',
    claimedDays: 55,
    notes: 'Bushy dwarf; needs wide spacing.',
    yieldEffect: 0.86,
    podMassG: 12,
    heightMm: 700,
    toughAtMm: 85,
    firstHarvestDay: 56,
    spines: 1.2,
    spacingMm: 900,
  },
  {
    code: 'SR',
    name: 'Sunhollow Ridged',
    seedSource: 'Fennick school garden club',
    entryType: 'open_pollinated',
    claimedDays: 60,
    notes: 'Eight-ridged green pods.',
    yieldEffect: 1.04,
    podMassG: 15,
    heightMm: 1400,
    toughAtMm: 100,
    firstHarvestDay: 61,
    spines: 2.1,
    spacingMm: 450,
  },
  {
    code: 'RS',
    name: 'Larkhaven Red Spire',
    seedSource: 'Larkhaven Seed Library, lot 2025-02',
    entryType: 'heirloom',
    claimedDays: 64,
    notes: 'Burgundy pods and stems.',
    yieldEffect: 0.97,
    podMassG: 14,
    heightMm: 1500,
    toughAtMm: 105,
    firstHarvestDay: 65,
    spines: 1.0,
    spacingMm: 450,
  },
  {
    code: 'TC',
    name: 'Tallow Creek Green',
    seedSource: 'Swapped at the spring seed fair',
    entryType: 'open_pollinated',
    claimedDays: 57,
    notes: 'Tall and quick; pods toughen early.',
    yieldEffect: 1.18,
    podMassG: 16,
    heightMm: 1900,
    toughAtMm: 75,
    firstHarvestDay: 58,
    spines: 2.6,
    spacingMm: 300,
  },
];

export const okraTraits: DemoTrait[] = [
  {
    key: 'marketable_yield',
    label: 'Marketable yield',
    quantityKind: 'mass',
    basis: 'harvest',
    direction: 'higher',
  },
  {
    key: 'pod_count',
    label: 'Marketable pod count',
    quantityKind: 'count',
    basis: 'harvest',
    direction: 'higher',
  },
  {
    key: 'plant_height',
    label: 'Plant height',
    quantityKind: 'length',
    basis: 'plant',
    direction: 'lower',
  },
  {
    key: 'pod_length_at_toughness',
    label: 'Pod length at toughness',
    quantityKind: 'length',
    basis: 'plant',
    direction: 'higher',
  },
  {
    key: 'vigor',
    label: 'Vigor',
    quantityKind: 'score',
    basis: 'plot',
    direction: 'higher',
    scaleMin: 1,
    scaleMax: 5,
  },
  {
    key: 'heat_tolerance',
    label: 'Heat tolerance',
    quantityKind: 'score',
    basis: 'plot',
    direction: 'higher',
    scaleMin: 1,
    scaleMax: 5,
  },
  {
    key: 'spines',
    label: 'Spines and skin irritation',
    quantityKind: 'score',
    basis: 'plot',
    direction: 'lower',
    scaleMin: 0,
    scaleMax: 3,
  },
];

const beanEntries: DemoEntry[] = [
  {
    code: 'PW',
    name: 'Pennywhistle Wax',
    seedSource: 'Larkhaven Seed Library, lot 2024-03',
    entryType: 'heirloom',
    claimedDays: 54,
    notes: 'Pale yellow wax pods.',
    yieldEffect: 0.94,
    podMassG: 5.5,
    heightMm: 420,
    toughAtMm: 130,
    firstHarvestDay: 55,
    spines: 0,
    spacingMm: 100,
  },
  {
    code: 'DP',
    name: 'Dovecote Purple',
    seedSource: 'Saved by a Quarry Lane volunteer',
    entryType: 'heirloom',
    claimedDays: 56,
    notes: 'Purple pods turn green when cooked.',
    yieldEffect: 1.12,
    podMassG: 6.2,
    heightMm: 480,
    toughAtMm: 150,
    firstHarvestDay: 57,
    spines: 0,
    spacingMm: 100,
  },
  {
    code: 'MF',
    name: 'Marrowfield Flat',
    seedSource: 'Spring seed fair',
    entryType: 'open_pollinated',
    claimedDays: 52,
    notes: 'Broad flat pods.',
    yieldEffect: 1.0,
    podMassG: 7.0,
    heightMm: 450,
    toughAtMm: 140,
    firstHarvestDay: 53,
    spines: 0,
    spacingMm: 100,
  },
  {
    code: 'ID',
    name: 'Inkdrop Black',
    seedSource: 'Larkhaven Seed Library, lot 2022-09',
    entryType: 'heirloom',
    claimedDays: 58,
    notes: 'Black seeded; grown for fresh pods here.',
    yieldEffect: 0.98,
    podMassG: 5.8,
    heightMm: 400,
    toughAtMm: 125,
    firstHarvestDay: 59,
    spines: 0,
    spacingMm: 100,
  },
  {
    code: 'SF',
    name: 'Silverfern Bush',
    seedSource: 'Fennick school garden club',
    entryType: 'open_pollinated',
    claimedDays: 55,
    notes: 'Silvery green round pods.',
    yieldEffect: 1.01,
    podMassG: 6.0,
    heightMm: 460,
    toughAtMm: 135,
    firstHarvestDay: 56,
    spines: 0,
    spacingMm: 100,
  },
];

const beanTraits: DemoTrait[] = [
  {
    key: 'marketable_yield',
    label: 'Marketable yield',
    quantityKind: 'mass',
    basis: 'harvest',
    direction: 'higher',
  },
  {
    key: 'pod_count',
    label: 'Marketable pod count',
    quantityKind: 'count',
    basis: 'harvest',
    direction: 'higher',
  },
  {
    key: 'plant_height',
    label: 'Plant height',
    quantityKind: 'length',
    basis: 'plant',
    direction: 'lower',
  },
  {
    key: 'vigor',
    label: 'Vigor',
    quantityKind: 'score',
    basis: 'plot',
    direction: 'higher',
    scaleMin: 1,
    scaleMax: 5,
  },
];

export const demoTrials: DemoTrial[] = [
  {
    slug: 'larkhaven-okra-2026',
    title: 'Larkhaven heirloom okra, three gardens',
    crop: 'Okra',
    season: '2026',
    design: 'multisite',
    status: 'active',
    description:
      'Six heirloom and open-pollinated okra varieties from the library shelf, grown in three randomized blocks at three volunteer gardens with no fertilizer, to find which yield best and stay tender longest in a hot summer.',
    sowingDate: '2026-05-04',
    transplantDate: '2026-05-25',
    seasonEnd: '2026-09-18',
    sites: okraSites,
    entries: okraEntries,
    traits: okraTraits,
    blocks: 3,
    rowLengthMm: 3000,
    rowSpacingMm: 900,
    fertilizer: { none: true },
    members: [
      { account: 'lead', role: 'lead' },
      { account: 'grower', role: 'grower', siteKeys: ['quarry'] },
      { account: 'grower2', role: 'grower' },
      { account: 'contributor', role: 'contributor' },
      { account: 'viewer', role: 'viewer' },
    ],
  },
  {
    slug: 'fennick-bush-beans-2026',
    title: 'Fennick bush beans',
    crop: 'Bush bean',
    season: '2026',
    design: 'rcbd',
    status: 'active',
    description: 'Five bush bean varieties in four randomized blocks in the schoolyard beds.',
    sowingDate: '2026-06-01',
    transplantDate: null,
    seasonEnd: '2026-08-28',
    sites: [{ ...okraSites[2]!, key: 'fennick' }],
    entries: beanEntries,
    traits: beanTraits,
    blocks: 4,
    rowLengthMm: 2000,
    rowSpacingMm: 600,
    fertilizer: { kind: 'Leaf-mould compost', rateGPerM2: 2000 },
    members: [
      { account: 'lead', role: 'lead' },
      { account: 'grower2', role: 'grower' },
      { account: 'viewer', role: 'viewer' },
    ],
  },
];

const round = (x: number, digits = 0) => Math.round(x * 10 ** digits) / 10 ** digits;
const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

export interface GeneratedPlot {
  siteKey: string;
  entryCode: string;
  block: number;
  position: number;
  plotNumber: number;
  plantsSet: number;
  plantsSurviving: number;
  inRowSpacingMm: number;
}
export interface GeneratedHarvest {
  plotNumber: number;
  siteKey: string;
  date: string;
  count: number;
  massG: number;
  grade: 'marketable' | 'cull';
}
export interface GeneratedObservation {
  plotNumber: number;
  siteKey: string;
  traitKey: string;
  date: string;
  value: number;
  plantNumber: number | null;
}
export interface GeneratedEvent {
  siteKey: string;
  kind: 'irrigation' | 'rainfall' | 'fertilizer' | 'thinning' | 'transplanting';
  date: string;
  method?: 'drip' | 'overhead' | 'hand';
  runTimeMin?: number;
  waterDepthMm?: number;
  rainMm?: number;
  amendmentKind?: string;
  rateGPerM2?: number;
  noneApplied?: boolean;
  note: string;
}

export interface GeneratedSeason {
  plots: GeneratedPlot[];
  harvests: GeneratedHarvest[];
  observations: GeneratedObservation[];
  events: GeneratedEvent[];
}

/** Depth of water from a run time: drip or sprinkler rate in mm per hour (common practice figures, no source). */
const irrigationRateMmPerHour: Record<'drip' | 'overhead' | 'hand', number> = {
  drip: 6,
  overhead: 10,
  hand: 15,
};

const byText = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/**
 * The demo trial's plot plan as the design page lays it out from the stored seed: entries in
 * code order and sites in name order (entry codes and site keys stand in for the row ids).
 */
export function demoLayout(trial: DemoTrial, seed = DEMO_SEED) {
  return randomizeLayout({
    design: trial.design,
    entryIds: trial.entries.map((e) => e.code).sort(byText),
    replicates: trial.blocks,
    siteIds: [...trial.sites].sort((a, b) => byText(a.name, b.name)).map((s) => s.key),
    seed,
  });
}

export function generateSeason(trial: DemoTrial, seed = DEMO_SEED): GeneratedSeason {
  const random: Random = createRandom(seed + trial.slug.length * 7919);
  // Scores with no variety effect come from a stream of their own: what they draw never shifts
  // the rest of the season's records.
  const nullTraitRandom: Random = createRandom(HEAT_SCORE_SEED + trial.slug.length);
  // The season's numbers are drawn plot by plot in the order the demo was first written in, so
  // they stay the same; the plot numbers are the plan the app itself makes from the stored seed.
  const drawOrder = randomizeLayout({
    design: trial.design,
    entryIds: trial.entries.map((e) => e.code),
    replicates: trial.blocks,
    siteIds: trial.sites.map((s) => s.key),
    seed,
  });
  const plan = new Map(
    demoLayout(trial, seed).map((p) => [`${p.siteId}:${p.block}:${p.entryId}`, p]),
  );
  const layout = drawOrder.map((p) => plan.get(`${p.siteId}:${p.block}:${p.entryId}`)!);
  const entryByCode = new Map(trial.entries.map((e) => [e.code, e]));
  const siteByKey = new Map(trial.sites.map((s) => [s.key, s]));
  const plots: GeneratedPlot[] = [];
  const harvests: GeneratedHarvest[] = [];
  const observations: GeneratedObservation[] = [];
  const start = trial.transplantDate ?? trial.sowingDate;
  const blockEffects = new Map<string, number>();

  for (const p of layout) {
    const entry = entryByCode.get(p.entryId)!;
    const site = siteByKey.get(p.siteId)!;
    const blockKey = `${p.siteId}:${p.block}`;
    if (!blockEffects.has(blockKey)) blockEffects.set(blockKey, random.normal(1, 0.05));
    const plantsSet = Math.floor(trial.rowLengthMm / entry.spacingMm);
    const plantsSurviving = plantsSet - (random.float() < 0.25 ? 1 : 0);
    plots.push({
      siteKey: p.siteId,
      entryCode: p.entryId,
      block: p.block,
      position: p.position,
      plotNumber: p.plotNumber,
      plantsSet,
      plantsSurviving,
      inRowSpacingMm: entry.spacingMm,
    });

    // Harvest rounds every third day from the first ripe pods to the season's end.
    const plotEffect =
      site.effect * blockEffects.get(blockKey)! * entry.yieldEffect * random.normal(1, 0.07);
    const firstDay =
      entry.firstHarvestDay + Math.round(random.normal(0, 1.5)) + (site.effect < 0.9 ? 3 : 0);
    const firstDate = addDays(trial.sowingDate, firstDay);
    const podsPerPlantPerRound = trial.podsPerPlantPerRound ?? (trial.crop === 'Okra' ? 1.1 : 4.5);
    for (
      let date = firstDate, round_ = 0;
      date <= trial.seasonEnd;
      date = addDays(date, 3), round_++
    ) {
      const ramp = Math.min(1, 0.35 + round_ * 0.2);
      const expected =
        podsPerPlantPerRound *
        plantsSurviving *
        plotEffect *
        ramp *
        (entry.spacingMm > 600 ? 1.8 : 1);
      const count = Math.max(0, Math.round(random.normal(expected, Math.sqrt(expected + 1))));
      const culls = Math.max(0, Math.round(count * clamp(random.normal(0.1, 0.04), 0, 0.4)));
      const marketable = count - culls;
      const podMass = entry.podMassG * random.normal(1, 0.04);
      if (marketable > 0)
        harvests.push({
          plotNumber: p.plotNumber,
          siteKey: p.siteId,
          date,
          count: marketable,
          massG: round(marketable * podMass, 1),
          grade: 'marketable',
        });
      if (culls > 0)
        harvests.push({
          plotNumber: p.plotNumber,
          siteKey: p.siteId,
          date,
          count: culls,
          massG: round(culls * podMass * 1.3, 1),
          grade: 'cull',
        });
    }

    // Sample-plant measurements late in the season: five plants (or pods) per plot.
    const measureOn = addDays(start, 70);
    const has = (key: string) => trial.traits.some((t) => t.key === key);
    for (let plant = 1; plant <= Math.min(5, plantsSurviving); plant++) {
      if (has('plant_height')) {
        observations.push({
          plotNumber: p.plotNumber,
          siteKey: p.siteId,
          traitKey: 'plant_height',
          date: measureOn,
          plantNumber: plant,
          value: round(entry.heightMm * Math.sqrt(site.effect) * random.normal(1, 0.08)),
        });
      }
      if (has('pod_length_at_toughness')) {
        observations.push({
          plotNumber: p.plotNumber,
          siteKey: p.siteId,
          traitKey: 'pod_length_at_toughness',
          date: measureOn,
          plantNumber: plant,
          value: round(entry.toughAtMm * random.normal(1, 0.09)),
        });
      }
    }
    const scoreOn = addDays(start, 60);
    if (has('vigor'))
      observations.push({
        plotNumber: p.plotNumber,
        siteKey: p.siteId,
        traitKey: 'vigor',
        date: scoreOn,
        plantNumber: null,
        value: clamp(Math.round(random.normal(2.2 + 1.6 * plotEffect, 0.6)), 1, 5),
      });
    // Heat tolerance: no real difference between varieties in this season; the analysis should not find one.
    if (has('heat_tolerance'))
      observations.push({
        plotNumber: p.plotNumber,
        siteKey: p.siteId,
        traitKey: 'heat_tolerance',
        date: scoreOn,
        plantNumber: null,
        value: clamp(Math.round(nullTraitRandom.normal(3.4, 0.8)), 1, 5),
      });
    if (has('spines'))
      observations.push({
        plotNumber: p.plotNumber,
        siteKey: p.siteId,
        traitKey: 'spines',
        date: scoreOn,
        plantNumber: null,
        value: clamp(Math.round(random.normal(entry.spines, 0.45)), 0, 3),
      });
  }

  const events: GeneratedEvent[] = [];
  for (const site of trial.sites) {
    if (trial.transplantDate)
      events.push({
        siteKey: site.key,
        kind: 'transplanting',
        date: trial.transplantDate,
        note: 'Seedlings set out from the library cold frame.',
      });
    events.push(
      'none' in trial.fertilizer
        ? {
            siteKey: site.key,
            kind: 'fertilizer',
            date: start,
            noneApplied: true,
            note: 'Low-input trial: no fertilizer or compost applied this season.',
          }
        : {
            siteKey: site.key,
            kind: 'fertilizer',
            date: trial.sowingDate,
            amendmentKind: trial.fertilizer.kind,
            rateGPerM2: trial.fertilizer.rateGPerM2,
            note: 'Worked into the top 10 cm before sowing.',
          },
    );
    for (let date = start; date <= trial.seasonEnd; date = addDays(date, 1)) {
      if (random.float() < 0.16) {
        const rainMm = round(Math.max(0.5, random.normal(9, 7)), 1);
        events.push({ siteKey: site.key, kind: 'rainfall', date, rainMm, note: '' });
      }
      if (
        site.irrigationMethod !== 'hand'
          ? addDays(start, 0) <= date && random.float() < 2 / 7
          : random.float() < 0.2
      ) {
        const runTimeMin =
          site.irrigationMethod === 'drip' ? 90 : site.irrigationMethod === 'overhead' ? 45 : 20;
        events.push({
          siteKey: site.key,
          kind: 'irrigation',
          date,
          method: site.irrigationMethod,
          runTimeMin,
          waterDepthMm: round(
            (irrigationRateMmPerHour[site.irrigationMethod] * runTimeMin) / 60,
            1,
          ),
          note: '',
        });
      }
    }
  }
  return { plots, harvests, observations, events };
}
