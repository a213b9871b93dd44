/**
 * A small randomized-complete-blocks trial written straight into the database: one site,
 * the given entries in every block (plot number = block × 100 + position), one trait, and its
 * lead when one is named.
 */
import type { Insertable } from 'kysely';
import type { DB } from '../../db/database';
import type { Database } from '../../db/schema';

export interface SmallTrial {
  trialId: string;
  siteId: string;
  entryIds: string[];
  traitId: string;
  /** plot number -> plot id */
  plotIds: Record<number, string>;
}

/** A plot vigor score on a 1–5 scale, higher is better: the trait most small trials need. */
export const vigorScoreTrait = {
  key: 'vigor',
  label: 'Vigor',
  quantity_kind: 'score',
  basis: 'plot',
  direction: 'higher',
  scale_min: 1,
  scale_max: 5,
} as const satisfies Omit<Insertable<Database['traits']>, 'trial_id'>;

export async function insertBlocksTrial(
  db: DB,
  opts: {
    trial: Pick<Insertable<Database['trials']>, 'slug' | 'title' | 'crop'> &
      Partial<Insertable<Database['trials']>>;
    siteName: string;
    entryNames: string[];
    blocks: number;
    trait: Omit<Insertable<Database['traits']>, 'trial_id'>;
    /** A user made the trial's lead. */
    leadId?: string;
  },
): Promise<SmallTrial> {
  const trial = await db
    .insertInto('trials')
    .values({ season: '2026', design: 'rcbd', status: 'active', ...opts.trial })
    .returning('id')
    .executeTakeFirstOrThrow();
  const site = await db
    .insertInto('sites')
    .values({ trial_id: trial.id, name: opts.siteName })
    .returning('id')
    .executeTakeFirstOrThrow();
  const entries = await db
    .insertInto('entries')
    .values(
      opts.entryNames.map((name, i) => ({
        trial_id: trial.id,
        name,
        code: `E${i + 1}`,
        entry_type: 'heirloom' as const,
      })),
    )
    .returning('id')
    .execute();
  const trait = await db
    .insertInto('traits')
    .values({ ...opts.trait, trial_id: trial.id })
    .returning('id')
    .executeTakeFirstOrThrow();
  const plots = await db
    .insertInto('plots')
    .values(
      Array.from({ length: opts.blocks }, (_, b) =>
        entries.map((entry, i) => ({
          trial_id: trial.id,
          site_id: site.id,
          entry_id: entry.id,
          block: b + 1,
          position: i + 1,
          plot_number: (b + 1) * 100 + i + 1,
        })),
      ).flat(),
    )
    .returning(['id', 'plot_number'])
    .execute();
  if (opts.leadId)
    await db
      .insertInto('trial_members')
      .values({ trial_id: trial.id, user_id: opts.leadId, role: 'lead' })
      .execute();
  return {
    trialId: trial.id,
    siteId: site.id,
    entryIds: entries.map((e) => e.id),
    traitId: trait.id,
    plotIds: Object.fromEntries(plots.map((p) => [p.plot_number, p.id])),
  };
}
