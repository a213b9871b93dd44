/** Writes the demo season into an empty database, in one transaction. */
import { hashPassword } from 'better-auth/crypto';
import crypto from 'node:crypto';
import type { ObjectStorage } from '../../server/storage/object-storage';
import type { DB } from '../database';
import { seedDemoPhotos } from './demo-photos';
import { seedDemoSeedLots } from './demo-seed-lots';
import { addDays } from '../../common/calendar-date';
import { demoGroup, joinDemoRegister, seedDemoRegister } from './demo-register';
import { EARLIER_SEASON_SEED, earlierDemoTrials } from './demo-earlier-seasons';
import { DEMO_SEED, demoAccounts, type DemoTrial, demoTrials, generateSeason } from './demo-season';
import { seedNetworkTrial } from './demo-network';
import { demoUserIds } from './demo-lead';
import { publishDemoSheet } from './demo-sheet';
import { seedSplitPlotTrial } from './demo-split-plot';
import { generateDemoWeather } from './demo-weather';
import { defaultPlausibleRange } from '../../common/trait-presets';

async function isEmpty(db: DB): Promise<boolean> {
  const row = await db
    .selectFrom('trials')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  const users = await db
    .selectFrom('users')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return Number(row.n) === 0 && Number(users.n) === 0;
}

/** Loads the demo season into an empty database; with a storage, its demo photos too. */
export async function seedDemoIfEmpty(db: DB, storage?: ObjectStorage): Promise<boolean> {
  if (!(await isEmpty(db))) return false;
  await seedDemo(db);
  await seedEarlierSeasons(db);
  await seedSplitPlotTrial(db);
  await seedNetworkTrial(db);
  if (storage) await seedDemoPhotos(db, storage);
  await publishDemoSheet(db);
  await seedDemoSeedLots(db);
  return true;
}

const chunk = <T>(items: T[], size = 500): T[][] =>
  Array.from({ length: Math.ceil(items.length / size) }, (_, i) =>
    items.slice(i * size, i * size + size),
  );

export async function seedDemo(db: DB): Promise<void> {
  const hashes = await Promise.all(demoAccounts.map((a) => hashPassword(a.password)));
  await db.transaction().execute(async (trx) => {
    const userIds = new Map<string, string>();
    for (const [i, account] of demoAccounts.entries()) {
      const id = crypto.randomUUID();
      userIds.set(account.key, id);
      await trx
        .insertInto('users')
        .values({
          id,
          name: account.name,
          email: account.email,
          email_verified: true,
          is_admin: account.isAdmin,
          created_at: new Date(),
          updated_at: new Date(),
        })
        .execute();
      await trx
        .insertInto('accounts')
        .values({
          id: crypto.randomUUID(),
          account_id: id,
          provider_id: 'credential',
          user_id: id,
          password: hashes[i]!,
          created_at: new Date(),
          updated_at: new Date(),
        })
        .execute();
    }
    const leadId = userIds.get('lead')!;
    for (const t of demoTrials) await writeDemoTrial(trx, t, userIds);
    await seedDemoRegister(trx, leadId);
  });
}

/** One demo trial with its sites, entries, traits, members, plan, records and weather. */
async function writeDemoTrial(
  trx: DB,
  t: DemoTrial,
  userIds: ReadonlyMap<string, string>,
  seed = DEMO_SEED,
): Promise<void> {
  const leadId = userIds.get('lead')!;
  const by = { created_by: leadId, updated_by: leadId };
  const trial = await trx
    .insertInto('trials')
    .values({
      slug: t.slug,
      title: t.title,
      crop: t.crop,
      season: t.season,
      design: t.design,
      status: t.status,
      description: t.description,
      sowing_date: t.sowingDate,
      transplant_date: t.transplantDate,
      replicates: t.blocks,
      // The seed the plot plan below was randomized from (see demoLayout).
      layout_seed: seed,
      layout_generated_at: new Date(`${addDays(t.sowingDate, -14)}T09:00:00Z`),
      row_length_mm: t.rowLengthMm,
      row_spacing_mm: t.rowSpacingMm,
      fertilizer_policy: 'none' in t.fertilizer ? 'none_applied' : 'as_recorded',
      ...by,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const siteIds = new Map<string, string>();
  for (const s of t.sites) {
    const row = await trx
      .insertInto('sites')
      .values({
        trial_id: trial.id,
        name: s.name,
        region: s.region,
        soil_texture: s.soilTexture,
        irrigation_method: s.irrigationMethod,
        notes: s.notes,
        ...by,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    siteIds.set(s.key, row.id);
  }
  const entryIds = new Map<string, string>();
  for (const e of t.entries) {
    const row = await trx
      .insertInto('entries')
      .values({
        trial_id: trial.id,
        name: e.name,
        code: e.code,
        seed_source: e.seedSource,
        entry_type: e.entryType,
        days_to_maturity_claimed: e.claimedDays,
        notes: e.notes,
        ...by,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    entryIds.set(e.code, row.id);
  }
  const traitIds = new Map<string, string>();
  for (const [order, tr] of t.traits.entries()) {
    const row = await trx
      .insertInto('traits')
      .values({
        trial_id: trial.id,
        key: tr.key,
        label: tr.label,
        quantity_kind: tr.quantityKind,
        basis: tr.basis,
        direction: tr.direction,
        scale_min: tr.scaleMin ?? null,
        scale_max: tr.scaleMax ?? null,
        plausible_min: defaultPlausibleRange(tr).plausibleMin,
        plausible_max: defaultPlausibleRange(tr).plausibleMax,
        sort_order: order,
        ...by,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    traitIds.set(tr.key, row.id);
  }
  for (const m of t.members) {
    const userId = userIds.get(m.account)!;
    await trx
      .insertInto('trial_members')
      .values({ trial_id: trial.id, user_id: userId, role: m.role, ...by })
      .execute();
    for (const siteKey of m.siteKeys ?? []) {
      await trx
        .insertInto('trial_member_sites')
        .values({
          trial_id: trial.id,
          user_id: userId,
          site_id: siteIds.get(siteKey)!,
          created_by: leadId,
        })
        .execute();
    }
  }

  const season = generateSeason(t, seed);
  const plotIds = new Map<string, string>();
  const plotRows = await trx
    .insertInto('plots')
    .values(
      season.plots.map((p) => ({
        trial_id: trial.id,
        site_id: siteIds.get(p.siteKey)!,
        entry_id: entryIds.get(p.entryCode)!,
        block: p.block,
        position: p.position,
        plot_number: p.plotNumber,
        plants_set: p.plantsSet,
        plants_surviving: p.plantsSurviving,
        in_row_spacing_mm: p.inRowSpacingMm,
        row_length_mm: t.rowLengthMm,
        row_spacing_mm: t.rowSpacingMm,
        ...by,
      })),
    )
    .returning(['id', 'site_id', 'plot_number'])
    .execute();
  for (const r of plotRows) plotIds.set(`${r.site_id}:${r.plot_number}`, r.id);
  const plotId = (siteKey: string, plotNumber: number) =>
    plotIds.get(`${siteIds.get(siteKey)}:${plotNumber}`)!;
  const grower = (siteKey: string) =>
    siteKey === 'quarry' && t.members.some((m) => m.account === 'grower')
      ? userIds.get('grower')!
      : userIds.get('grower2')!;

  for (const rows of chunk(season.harvests)) {
    await trx
      .insertInto('harvests')
      .values(
        rows.map((h) => ({
          trial_id: trial.id,
          plot_id: plotId(h.siteKey, h.plotNumber),
          harvested_on: h.date,
          fruit_count: h.count,
          mass_g: h.massG,
          grade: h.grade,
          created_by: grower(h.siteKey),
          updated_by: grower(h.siteKey),
        })),
      )
      .execute();
  }
  for (const rows of chunk(season.observations)) {
    await trx
      .insertInto('observations')
      .values(
        rows.map((o) => ({
          trial_id: trial.id,
          plot_id: plotId(o.siteKey, o.plotNumber),
          trait_id: traitIds.get(o.traitKey)!,
          observed_on: o.date,
          value: o.value,
          plant_number: o.plantNumber,
          created_by: grower(o.siteKey),
          updated_by: grower(o.siteKey),
        })),
      )
      .execute();
  }
  for (const rows of chunk(season.events)) {
    await trx
      .insertInto('field_events')
      .values(
        rows.map((e) => ({
          trial_id: trial.id,
          site_id: siteIds.get(e.siteKey)!,
          kind: e.kind,
          occurred_on: e.date,
          irrigation_method: e.method ?? null,
          run_time_min: e.runTimeMin ?? null,
          water_depth_mm: e.waterDepthMm ?? null,
          rain_mm: e.rainMm ?? null,
          amendment_kind: e.amendmentKind ?? null,
          rate_g_per_m2: e.rateGPerM2 ?? null,
          none_applied: e.noneApplied ?? false,
          note: e.note,
          created_by: grower(e.siteKey),
          updated_by: grower(e.siteKey),
        })),
      )
      .execute();
  }
  // Invented daily weather for each site (rain matches the rainfall records).
  for (const rows of chunk(generateDemoWeather(t, season.events, seed))) {
    await trx
      .insertInto('daily_weather')
      .values(
        rows.map((w) => ({
          trial_id: trial.id,
          site_id: siteIds.get(w.siteKey)!,
          observed_on: w.date,
          tmin_c: w.tminC,
          tmax_c: w.tmaxC,
          rain_mm: w.rainMm,
          source: 'demo' as const,
          ...by,
        })),
      )
      .execute();
  }
}

/**
 * The earlier seasons (a first okra season and a tomato trial), written after the current one
 * and joined to the same register, so varieties have a record across seasons.
 */
export async function seedEarlierSeasons(db: DB): Promise<void> {
  const userIds = await demoUserIds(db);
  const group = await db
    .selectFrom('groups')
    .select('id')
    .where('slug', '=', demoGroup.slug)
    .executeTakeFirstOrThrow();
  await db.transaction().execute(async (trx) => {
    for (const t of earlierDemoTrials) await writeDemoTrial(trx, t, userIds, EARLIER_SEASON_SEED);
    await joinDemoRegister(trx, group.id, userIds.get('lead')!);
  });
}
