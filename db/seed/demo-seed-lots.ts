/**
 * The demo seed library's seed: a lot with a germination test for a few varieties (one test
 * old and low, so its warnings show), the okra trial's entries linked to the lots they were
 * sown from, and one open offer of packets from the bean trial, whose published sheet links
 * to it. Invented figures throughout.
 */
import type { DB } from '../database';

interface DemoLot {
  variety: string;
  label: string;
  source: string;
  harvestYear: number;
  amount: number;
  amountUnit: 'g' | 'seeds';
  storagePlace: string;
  test: { testedOn: string; seedsTested: number; seedsGerminated: number; days: number };
  /** Trial entries of this variety sown from the lot. */
  sownIn: string[];
  offer?: { packets: number; note: string };
}

export const demoLots: DemoLot[] = [
  {
    variety: 'Velvet Lantern',
    label: 'VL-25',
    source: 'Saved at Quarry Lane Allotment',
    harvestYear: 2025,
    amount: 38,
    amountUnit: 'g',
    storagePlace: 'Seed tin 2, north shed',
    test: { testedOn: '2026-03-02', seedsTested: 50, seedsGerminated: 46, days: 10 },
    sownIn: ['larkhaven-okra-2026'],
  },
  {
    variety: 'Mossbank Long',
    label: 'ML-24',
    source: 'Swap table, Mill Pond Garden',
    harvestYear: 2024,
    amount: 1200,
    amountUnit: 'seeds',
    storagePlace: 'Envelope box B',
    test: { testedOn: '2025-03-10', seedsTested: 100, seedsGerminated: 71, days: 14 },
    sownIn: ['larkhaven-okra-2026'],
  },
  {
    variety: 'Dovecote Purple',
    label: 'DP-26',
    source: 'Saved at Fennick Schoolyard Beds',
    harvestYear: 2026,
    amount: 250,
    amountUnit: 'g',
    storagePlace: 'Seed tin 5, north shed',
    test: { testedOn: '2026-10-20', seedsTested: 100, seedsGerminated: 93, days: 8 },
    sownIn: [],
    offer: {
      packets: 12,
      note: 'About 30 seeds a packet, saved from this season’s schoolyard beds.',
    },
  },
];

/** Writes the demo lots, tests, sowings and the offer (after the register exists). */
export async function seedDemoSeedLots(db: DB): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const group = await trx
      .selectFrom('groups')
      .innerJoin('group_members as m', 'm.group_id', 'groups.id')
      .select(['groups.id', 'm.user_id'])
      .where('groups.slug', '=', 'larkhaven-seed-library')
      .where('m.role', '=', 'coordinator')
      .executeTakeFirstOrThrow();
    const by = group.user_id;
    for (const d of demoLots) {
      const variety = await trx
        .selectFrom('varieties')
        .select('id')
        .where('group_id', '=', group.id)
        .where('name', '=', d.variety)
        .executeTakeFirstOrThrow();
      const lot = await trx
        .insertInto('seed_lots')
        .values({
          variety_id: variety.id,
          label: d.label,
          source: d.source,
          harvest_year: d.harvestYear,
          amount: d.amount,
          amount_unit: d.amountUnit,
          storage_place: d.storagePlace,
          created_by: by,
          updated_by: by,
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      await trx
        .insertInto('germination_tests')
        .values({
          lot_id: lot.id,
          tested_on: d.test.testedOn,
          seeds_tested: d.test.seedsTested,
          seeds_germinated: d.test.seedsGerminated,
          days: d.test.days,
          created_by: by,
        })
        .execute();
      for (const trialSlug of d.sownIn)
        await trx
          .updateTable('entries')
          .set({ lot_id: lot.id })
          .where('variety_id', '=', variety.id)
          .where('trial_id', 'in', (eb) =>
            eb.selectFrom('trials').select('id').where('slug', '=', trialSlug),
          )
          .execute();
      if (d.offer)
        await trx
          .insertInto('seed_offers')
          .values({
            variety_id: variety.id,
            lot_id: lot.id,
            packets_offered: d.offer.packets,
            packets_left: d.offer.packets,
            note: d.offer.note,
            created_by: by,
            updated_by: by,
          })
          .execute();
    }
  });
}
