/**
 * The demo's volunteer network: twelve pole bean varieties from the seed library, twenty home
 * gardens that each grow four of them (an incomplete block per garden, laid out by the app's own
 * plan from the stored seed), three gardens that dropped out mid-season and two plots lost to
 * slugs. Everything here is invented: gardens, volunteers, varieties and yields.
 */
import { defaultPlausibleRange } from '../../common/trait-presets';
import { randomizeLayout } from '../../common/layout';
import { createRandom } from '../../common/random';
import { writeCsv } from '../../common/csv';
import type { DB } from '../database';
import { demoGroup, joinDemoRegister } from './demo-register';
import type { DemoAccountKey } from './demo-season';
import { demoUserIds } from './demo-lead';

export const NETWORK_SLUG = 'larkhaven-pole-bean-network-2026';
/** The seed the plan was randomized from (stored on the trial, as the layout page does). */
export const NETWORK_LAYOUT_SEED = 613;
export const NETWORK_BLOCK_SIZE = 4;
const YIELD_SEED = 20260613;

export const networkEntries = [
  ['PB01', 'Alder Runner', 62],
  ['PB02', 'Brackenhill Speckled', 140],
  ['PB03', 'Candlewick Purple', -90],
  ['PB04', 'Dunnock Cutshort', 25],
  ['PB05', 'Eelgrass Greasy', 210],
  ['PB06', 'Fieldfare White', -160],
  ['PB07', 'Goldcrest Wax', 5],
  ['PB08', 'Holloway Cornfield', 95],
  ['PB09', 'Inchmore Lazy Wife', -40],
  ['PB10', 'Jackdaw Cherokee', 170],
  ['PB11', 'Kittiwake Case Knife', -120],
  ['PB12', 'Lapwing Rattlesnake', 60],
].map(([code, name, effectG]) => ({
  code: code as string,
  name: name as string,
  /** Invented yield advantage of the variety, g per plot. */
  effectG: effectG as number,
}));

/** Twenty invented home gardens; the volunteer's name is in the notes. */
export const networkGardens = [
  ['Ashby Row garden', 'Tamsin Ashby'],
  ['Barrowgate allotment', 'Idris Quell'],
  ['Chapel Walk yard', 'Merle Oduya'],
  ['Drover Lane plot', 'Kasimir Vell'],
  ['Elmstead terrace', 'Rosalind Hatch'],
  ['Furze Hill beds', 'Oskar Lindqvar'],
  ['Glebe Cottage garden', 'Noor Hadley'],
  ['Hartwell raised beds', 'Benedikt Sorrel'],
  ['Ivy Court balcony tubs', 'Priya Danecourt'],
  ['Juniper Close garden', 'Aled Marrow'],
  ['Kestrel Way plot', 'Lucia Fennimore'],
  ['Lantern Street yard', 'Corin Ashgrove'],
  ['Marsh End allotment', 'Delphine Yarrow'],
  ['Nettlebed garden', 'Hamish Trewin'],
  ['Orchard Rise beds', 'Wren Callister'],
  ['Pennyroyal Lane plot', 'Teodor Blythe'],
  ['Quayside community bed', 'Saoirse Penhallow'],
  ['Rookery Farm corner', 'Jonah Weatherill'],
  ['Sloe Hedge garden', 'Ingrid Faulk'],
  ['Thornbury school bed', 'Malik Osgood'],
].map(([name, volunteer], i) => ({
  key: `g${String(i + 1).padStart(2, '0')}`,
  name: name!,
  volunteer: volunteer!,
}));

/** Gardens that stopped recording mid-season, and plots lost in gardens that kept on. */
export const droppedGardens = ['Furze Hill beds', 'Kestrel Way plot', 'Quayside community bed'];
export const lostPlots = [
  { garden: 'Chapel Walk yard', plotNumber: 103 },
  { garden: 'Orchard Rise beds', plotNumber: 102 },
];

const byText = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/** The plan as the layout page makes it: entries in code order, gardens in name order. */
export function networkLayout() {
  return randomizeLayout({
    design: 'network',
    entryIds: networkEntries.map((e) => e.code).sort(byText),
    replicates: 0,
    blockSize: NETWORK_BLOCK_SIZE,
    siteIds: networkGardens.map((g) => g.name).sort(byText),
    seed: NETWORK_LAYOUT_SEED,
  });
}

export interface NetworkPlot {
  garden: string;
  entryCode: string;
  entryName: string;
  block: number;
  position: number;
  plotNumber: number;
  replicate: number;
  /** Fresh pod yield, g per plot; null where the garden dropped out or the plot was lost. */
  yieldG: number | null;
}

/** Every planned plot with its invented yield: gardens differ more than varieties do. */
export function networkSeason(): NetworkPlot[] {
  const random = createRandom(YIELD_SEED);
  const gardenEffect = new Map(
    [...networkGardens]
      .sort((a, b) => byText(a.name, b.name))
      .map((g) => [g.name, random.normal(0, 380)]),
  );
  const entry = new Map(networkEntries.map((e) => [e.code, e]));
  return networkLayout().map((p) => {
    const e = entry.get(p.entryId)!;
    const value = 1750 + e.effectG + gardenEffect.get(p.siteId)! + random.normal(0, 140);
    const gone =
      droppedGardens.includes(p.siteId) ||
      lostPlots.some((l) => l.garden === p.siteId && l.plotNumber === p.plotNumber);
    return {
      garden: p.siteId,
      entryCode: e.code,
      entryName: e.name,
      block: p.block,
      position: p.position,
      plotNumber: p.plotNumber,
      replicate: p.replicate!,
      yieldG: gone ? null : Math.round(value),
    };
  });
}

/** The recorded plots as the analysis reads them (site = garden), for the reference fixture. */
export function networkCsv(): string {
  const rows = networkSeason().filter((p) => p.yieldG !== null);
  return writeCsv(
    ['site', 'variety', 'value'],
    rows.map((p) => [p.garden, p.entryName, p.yieldG]),
  );
}

const yieldTrait = {
  key: 'pod_yield',
  label: 'Fresh pod yield',
  quantityKind: 'mass',
  basis: 'plot',
  direction: 'higher',
} as const;

/** Writes the network trial and joins it to the seed library's register. */
export async function seedNetworkTrial(db: DB): Promise<void> {
  const userIds = await demoUserIds(db);
  const idOf = (key: DemoAccountKey) => userIds.get(key)!;
  const leadId = idOf('lead');
  const by = { created_by: leadId, updated_by: leadId };
  await db.transaction().execute(async (trx) => {
    const trial = await trx
      .insertInto('trials')
      .values({
        slug: NETWORK_SLUG,
        title: 'Pole beans across twenty home gardens',
        crop: 'Pole bean',
        season: '2026',
        design: 'network',
        status: 'active',
        description:
          'Twelve pole bean varieties from the library shelf. Each volunteer grew four of them in their own garden, so every garden is one incomplete block; the gardens were laid out so any two varieties share a garden about equally often. Three gardens stopped recording mid-season.',
        sowing_date: '2026-05-20',
        replicates: 6,
        block_size: NETWORK_BLOCK_SIZE,
        layout_seed: NETWORK_LAYOUT_SEED,
        layout_generated_at: new Date('2026-05-06T09:00:00Z'),
        row_length_mm: 1500,
        row_spacing_mm: 600,
        in_row_spacing_mm: 150,
        fertilizer_policy: 'as_recorded',
        ...by,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const siteIds = new Map<string, string>();
    for (const g of networkGardens) {
      const row = await trx
        .insertInto('sites')
        .values({
          trial_id: trial.id,
          name: g.name,
          region: 'Larkhaven',
          notes: `Volunteer: ${g.volunteer}.${droppedGardens.includes(g.name) ? ' Stopped recording in July.' : ''}`,
          ...by,
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      siteIds.set(g.name, row.id);
    }
    const entryIds = new Map<string, string>();
    for (const e of networkEntries) {
      const row = await trx
        .insertInto('entries')
        .values({
          trial_id: trial.id,
          code: e.code,
          name: e.name,
          seed_source: 'Larkhaven Seed Library shelf',
          entry_type: 'heirloom',
          in_row_spacing_mm: 150,
          ...by,
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      entryIds.set(e.code, row.id);
    }
    const trait = await trx
      .insertInto('traits')
      .values({
        trial_id: trial.id,
        key: yieldTrait.key,
        label: yieldTrait.label,
        quantity_kind: yieldTrait.quantityKind,
        basis: yieldTrait.basis,
        direction: yieldTrait.direction,
        plausible_min: defaultPlausibleRange(yieldTrait).plausibleMin,
        plausible_max: defaultPlausibleRange(yieldTrait).plausibleMax,
        sort_order: 0,
        ...by,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await trx
      .insertInto('trial_members')
      .values([
        { trial_id: trial.id, user_id: leadId, role: 'lead', ...by },
        { trial_id: trial.id, user_id: idOf('grower2'), role: 'grower', ...by },
        { trial_id: trial.id, user_id: idOf('viewer'), role: 'viewer', ...by },
      ])
      .execute();
    const season = networkSeason();
    const plots = await trx
      .insertInto('plots')
      .values(
        season.map((p) => ({
          trial_id: trial.id,
          site_id: siteIds.get(p.garden)!,
          entry_id: entryIds.get(p.entryCode)!,
          block: p.block,
          position: p.position,
          plot_number: p.plotNumber,
          replicate: p.replicate,
          in_row_spacing_mm: 150,
          row_length_mm: 1500,
          row_spacing_mm: 600,
          ...by,
        })),
      )
      .returning('id')
      .execute();
    const recorded = season
      .map((p, i) => ({ p, id: plots[i]!.id }))
      .filter(({ p }) => p.yieldG !== null);
    await trx
      .insertInto('observations')
      .values(
        recorded.map(({ p, id }) => ({
          trial_id: trial.id,
          plot_id: id,
          trait_id: trait.id,
          observed_on: '2026-08-24',
          value: p.yieldG,
          value_date: null,
          plant_number: null,
          created_by: idOf('grower2'),
          updated_by: idOf('grower2'),
        })),
      )
      .execute();
    const group = await trx
      .selectFrom('groups')
      .select('id')
      .where('slug', '=', demoGroup.slug)
      .executeTakeFirstOrThrow();
    await joinDemoRegister(trx, group.id, leadId);
  });
}
