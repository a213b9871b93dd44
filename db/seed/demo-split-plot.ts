/**
 * The demo's fertilizer × variety split plot (invented people, places, varieties and data): does
 * withholding fertilizer bring pods earlier in heirloom bush beans, but not in a modern productive
 * one? Fertilizer (none / pre-plant) on main plots within four blocks, four varieties on the
 * subplots, one "days to first pods" reading per plot (the date the first pods showed). Written
 * after the other demo trials.
 */
import crypto from 'node:crypto';
import { addDays } from '../../common/calendar-date';
import { randomizeLayout } from '../../common/layout';
import { createRandom } from '../../common/random';
import type { DB } from '../database';
import { demoGroup, joinDemoRegister } from './demo-register';
import { DEMO_SEED, type DemoAccountKey } from './demo-season';
import { demoUserIds } from './demo-lead';

export const SPLIT_PLOT_SLUG = 'wendle-fertilizer-beans-2026';
const SOWN = '2026-05-20';
const levels = ['none', 'pre-plant'];
/** The four varieties, joined to the demo register like every demo trial's entries. */
export const splitPlotVarieties = () => varieties.map((v) => v.name);
/** Days from sowing to first pods with pre-plant fertilizer, and the days withholding it saves. */
const varieties = [
  { code: 'CP', name: 'Corvale Prime', type: 'hybrid', days: 50, earlierWithout: 0 },
  { code: 'GR', name: 'Greywater Runner', type: 'heirloom', days: 58, earlierWithout: 5 },
  { code: 'MW', name: 'Mossbank Wax', type: 'heirloom', days: 56, earlierWithout: 4 },
  { code: 'TP', name: 'Tansy Purple', type: 'heirloom', days: 60, earlierWithout: 6 },
] as const;

/** Invented plot readings: variety, fertilizer, block and main-plot effects and plot noise. */
export function splitPlotDays(
  plan: { block: number; treatment: string | null; entryCode: string }[],
  seed = DEMO_SEED,
) {
  const random = createRandom(seed + 13);
  const blockEffect = [0, 1.5, -1, 0.5, -1];
  const mainPlot = new Map<string, number>();
  return plan.map((p) => {
    const v = varieties.find((x) => x.code === p.entryCode)!;
    const key = `${p.block}:${p.treatment}`;
    if (!mainPlot.has(key)) mainPlot.set(key, random.normal(0, 0.8));
    const days =
      v.days -
      (p.treatment === 'none' ? v.earlierWithout : 0) +
      blockEffect[p.block]! +
      mainPlot.get(key)! +
      random.normal(0, 1);
    return Math.round(days);
  });
}

export async function seedSplitPlotTrial(db: DB): Promise<void> {
  const userIds = await demoUserIds(db);
  const idOf = (key: DemoAccountKey) => userIds.get(key)!;
  const leadId = idOf('lead');
  const growerId = idOf('grower2');
  const by = { created_by: leadId, updated_by: leadId };
  await db.transaction().execute(async (trx) => {
    const trial = await trx
      .insertInto('trials')
      .values({
        slug: SPLIT_PLOT_SLUG,
        title: 'Wendle bush beans with and without fertilizer',
        crop: 'Bush bean',
        season: '2026',
        design: 'rcbd',
        status: 'active',
        description:
          'Does withholding fertilizer bring pods earlier in our heirloom bush beans, but not in a modern productive variety? Fertilizer (none or pre-plant) on main plots in four blocks, four varieties on the subplots of each.',
        sowing_date: SOWN,
        replicates: 4,
        layout_seed: DEMO_SEED,
        layout_generated_at: new Date(`${addDays(SOWN, -14)}T09:00:00Z`),
        row_length_mm: 2000,
        row_spacing_mm: 600,
        fertilizer_policy: 'as_recorded',
        fertilizer_notes:
          'Pre-plant main plots: a balanced granular fertilizer worked in at the label rate a week before sowing; none on the other main plots.',
        factor_name: 'Fertilizer',
        factor_levels: levels,
        factor_arrangement: 'split_plot',
        ...by,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const site = await trx
      .insertInto('sites')
      .values({
        trial_id: trial.id,
        name: 'Wendle allotment',
        region: 'Wendle, river side',
        soil_texture: 'sandy loam',
        irrigation_method: 'drip',
        ...by,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const entries = [];
    for (const v of varieties)
      entries.push(
        await trx
          .insertInto('entries')
          .values({
            trial_id: trial.id,
            name: v.name,
            code: v.code,
            entry_type: v.type,
            in_row_spacing_mm: 100,
            ...by,
          })
          .returning(['id', 'code'])
          .executeTakeFirstOrThrow(),
      );
    const trait = await trx
      .insertInto('traits')
      .values({
        trial_id: trial.id,
        key: 'days_to_first_pods',
        label: 'Days to first pods',
        // Recorded as the date the first pods showed; the analysis counts days from sowing.
        quantity_kind: 'date',
        basis: 'plot',
        direction: 'lower',
        sort_order: 0,
        ...by,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    for (const [account, role] of [
      ['lead', 'lead'],
      ['grower2', 'grower'],
      ['viewer', 'viewer'],
    ] as const)
      await trx
        .insertInto('trial_members')
        .values({ trial_id: trial.id, user_id: idOf(account), role, ...by })
        .execute();
    // The plan the layout page makes from the stored seed (entries by code).
    const plan = randomizeLayout({
      design: 'rcbd',
      entryIds: entries.map((e) => e.id),
      replicates: 4,
      siteIds: [site.id],
      seed: DEMO_SEED,
      factor: { levels, arrangement: 'split_plot' },
    });
    const codeOf = new Map(entries.map((e) => [e.id, e.code]));
    const plots = await trx
      .insertInto('plots')
      .values(
        plan.map((p) => ({
          id: crypto.randomUUID(),
          trial_id: trial.id,
          site_id: site.id,
          entry_id: p.entryId,
          block: p.block,
          position: p.position,
          plot_number: p.plotNumber,
          treatment: p.treatment,
          in_row_spacing_mm: 100,
          row_length_mm: 2000,
          row_spacing_mm: 600,
          ...by,
        })),
      )
      .returning(['id'])
      .execute();
    const days = splitPlotDays(plan.map((p) => ({ ...p, entryCode: codeOf.get(p.entryId)! })));
    await trx
      .insertInto('observations')
      .values(
        plots.map((p, i) => ({
          trial_id: trial.id,
          plot_id: p.id,
          trait_id: trait.id,
          observed_on: addDays(SOWN, days[i]!),
          value_date: addDays(SOWN, days[i]!),
          created_by: growerId,
          updated_by: growerId,
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
