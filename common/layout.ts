/**
 * Randomized plot plans. Completely randomized: every plot of a site drawn in one random order.
 * Randomized complete blocks: each block holds every entry once, in its own random order,
 * repeated per site with a fresh randomization. Reproducible from the stored seed.
 */
import { createRandom } from './random';

export type LayoutDesign = 'crd' | 'rcbd' | 'multisite';

export interface LayoutInput {
  design: LayoutDesign;
  entryIds: readonly string[];
  /** Replicates per entry: blocks for rcbd and multisite, plots per entry for crd. */
  replicates: number;
  siteIds: readonly string[];
  seed: number;
}

export interface PlannedPlot {
  siteId: string;
  entryId: string;
  block: number;
  /** Order along the row within the block (crd: within the site). */
  position: number;
  /** Field-style number: block digit(s) then position, e.g. 101, 102 … 201. */
  plotNumber: number;
}

export function plotNumberOf(block: number, position: number, positionsPerBlock: number): number {
  const width = positionsPerBlock >= 100 ? 1000 : 100;
  return block * width + position;
}

export function randomizeLayout(input: LayoutInput): PlannedPlot[] {
  const { design, entryIds, replicates, siteIds, seed } = input;
  if (entryIds.length < 2) throw new Error('A trial needs at least two entries to compare.');
  if (!Number.isInteger(replicates) || replicates < 1)
    throw new Error('Replicates must be a whole number of 1 or more.');
  if (siteIds.length < 1) throw new Error('Add a site before laying out plots.');
  if (design !== 'multisite' && siteIds.length > 1) {
    throw new Error('Only the several-sites design lays out plots at more than one site.');
  }
  const random = createRandom(seed);
  const plots: PlannedPlot[] = [];
  for (const siteId of siteIds) {
    if (design === 'crd') {
      const order = random.shuffle(
        entryIds.flatMap((id) => Array.from({ length: replicates }, () => id)),
      );
      order.forEach((entryId, i) =>
        plots.push({
          siteId,
          entryId,
          block: 1,
          position: i + 1,
          plotNumber: plotNumberOf(1, i + 1, order.length),
        }),
      );
      continue;
    }
    for (let block = 1; block <= replicates; block++) {
      random
        .shuffle(entryIds)
        .forEach((entryId, i) =>
          plots.push({
            siteId,
            entryId,
            block,
            position: i + 1,
            plotNumber: plotNumberOf(block, i + 1, entryIds.length),
          }),
        );
    }
  }
  return plots;
}
