/**
 * Writes fixtures/analysis/mixed-incomplete-alpha.csv: a fictional single-site trial laid out by
 * our own resolvable incomplete-block generator (12 entries, 4 replicates, blocks of 4, seed
 * INCOMPLETE_SEED) with invented pod yields and two plots lost; the data R's reference fit reads
 * (fixtures/analysis/r/incomplete-alpha.R). Run once:
 *   npx tsx scripts/export-incomplete-fixture.ts && (cd fixtures/analysis && Rscript r/incomplete-alpha.R)
 */
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { randomizeLayout } from '../common/layout';
import { createRandom } from '../common/random';
import { projectRoot } from '../server/env';

const INCOMPLETE_SEED = 2718;
const names = [
  'Brackenridge Wax',
  'Corrie Dusk',
  'Dunmore Speckle',
  'Elderwick Flat',
  'Fennick Stripe',
  'Glasswater Pod',
  'Harrowgate Violet',
  'Islay Runner',
  'Kettlewell Cream',
  'Lowther Gold',
  'Mossbank Purple',
  'Nethercott Long',
];
const codes = names.map((_, i) => `A${String(i + 1).padStart(2, '0')}`);
const plan = randomizeLayout({
  design: 'incomplete',
  entryIds: codes,
  replicates: 4,
  blockSize: 4,
  siteIds: ['field'],
  seed: INCOMPLETE_SEED,
});
// Invented effects: entries differ by about 120 g a plot, replicates and blocks within them by
// more, plots by about 90 g.
const random = createRandom(93);
const entryEffect = codes.map(() => random.normal(0, 120));
const repEffect = [1, 2, 3, 4].map(() => random.normal(0, 250));
const blockEffect = new Map<number, number>();
const lost = new Set([7, 30]);
const rows = plan.map((p, i) => {
  if (!blockEffect.has(p.block)) blockEffect.set(p.block, random.normal(0, 110));
  const e = codes.indexOf(p.entryId);
  const value =
    1600 +
    entryEffect[e]! +
    repEffect[p.replicate! - 1]! +
    blockEffect.get(p.block)! +
    random.normal(0, 90);
  return { p, name: names[e]!, value: Math.round(value), lost: lost.has(i) };
});
const csv = [
  'plot,replicate,block,code,variety,value',
  ...rows
    .filter((r) => !r.lost)
    .map(
      (r) => `${r.p.plotNumber},${r.p.replicate},${r.p.block},${r.p.entryId},${r.name},${r.value}`,
    ),
];
writeFileSync(
  path.join(projectRoot, 'fixtures/analysis/mixed-incomplete-alpha.csv'),
  `${csv.join('\n')}\n`,
);
