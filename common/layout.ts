/**
 * Randomized plot plans. Completely randomized: every plot of a site drawn in one random order.
 * Randomized complete blocks: each block holds every entry once, in its own random order,
 * repeated per site with a fresh randomization. Incomplete blocks: each replicate split into
 * blocks of k entries (common/incomplete-blocks.ts), at one site or one block per garden.
 * Reproducible from the stored seed.
 * With a second factor (a treatment) in complete blocks: a factorial puts every treatment ×
 * entry plot once in each block, in one random order; a split plot randomizes the treatments to
 * main plots within each block, then the entries to subplots within each main plot.
 */
import type { FactorArrangement } from './contracts/trials';
import { blockSizes, planIncompleteBlocks } from './incomplete-blocks';
import { createRandom } from './random';

export type LayoutDesign = 'crd' | 'rcbd' | 'multisite' | 'incomplete' | 'network';

export interface LayoutInput {
  design: LayoutDesign;
  entryIds: readonly string[];
  /**
   * Replicates per entry: blocks for rcbd and multisite, plots per entry for crd, replicates
   * (each holding every entry once) for incomplete blocks; unused for a network, whose
   * replicates follow from the number of gardens.
   */
  replicates: number;
  siteIds: readonly string[];
  seed: number;
  /** A second factor, laid out in complete blocks (rcbd or multisite). */
  factor?: { levels: readonly string[]; arrangement: FactorArrangement } | null;
  /** Entries per block (incomplete blocks) or per garden (network). */
  blockSize?: number | null;
}

/** The layout form's field a refusal is about; null when it is the trial's entries, sites or design. */
export type LayoutField = 'replicates' | 'blockSize' | 'factorName' | 'factorLevels';

export interface LayoutProblem {
  field: LayoutField | null;
  message: string;
}

/** A layout refused for its arguments (`problem` says which field and why). */
export class LayoutRefused extends Error {
  constructor(readonly problem: LayoutProblem) {
    super(problem.message);
  }
}

export interface PlannedPlot {
  siteId: string;
  entryId: string;
  block: number;
  /** Order along the row within the block (crd: within the site). */
  position: number;
  /** Field-style number: block digit(s) then position, e.g. 101, 102 … 201. */
  plotNumber: number;
  /** The plot's level of the second factor; null in a one-factor trial. */
  treatment: string | null;
  /** Split plot: the main plot within the block (1, 2 …); null otherwise. */
  mainPlot: number | null;
  /** Incomplete blocks and networks: the replicate the block belongs to. */
  replicate?: number;
}

/** Gardens of a network that make up one replicate of every entry, for v entries k to a garden. */
export const gardensPerReplicate = (entries: number, perGarden: number) =>
  blockSizes(entries, perGarden).length;

/** Largest block number a layout may use. */
export const MAX_BLOCKS = 99;

export function plotNumberOf(block: number, position: number, positionsPerBlock: number): number {
  const width = positionsPerBlock >= 100 ? 1000 : 100;
  return block * width + position;
}

/**
 * Why a layout cannot be drawn from these arguments, in the lead's words (the first reason), or
 * null. Every check on randomizeLayout's arguments is here, so the server's refusal and the
 * plan's own agree.
 */
export function layoutProblem(input: Omit<LayoutInput, 'seed'>): LayoutProblem | null {
  const { design, entryIds, replicates, siteIds } = input;
  const v = entryIds.length;
  const problem = (field: LayoutField | null, message: string) => ({ field, message });
  if (v < 2) return problem(null, 'Add at least two entries before laying out plots.');
  if (design !== 'network' && (!Number.isInteger(replicates) || replicates < 1))
    return problem('replicates', 'Replicates must be a whole number of 1 or more.');
  if (siteIds.length < 1) return problem(null, 'Add a site before laying out plots.');
  if (design !== 'multisite' && design !== 'network' && siteIds.length > 1)
    return problem(
      null,
      `This design lays out one site, but the trial has ${siteIds.length}. Choose “Blocks at several sites” in the settings, or remove the extra sites.`,
    );
  if (design === 'incomplete' || design === 'network') {
    const what = design === 'network' ? 'each garden grows' : 'each block holds';
    const k = input.blockSize;
    if (k == null) return problem('blockSize', `Give how many entries ${what}.`);
    if (!Number.isInteger(k) || k < 2 || k >= v)
      return problem(
        'blockSize',
        `With ${v} entries, ${what} from 2 to ${v - 1} of them${k >= v ? ` (all ${v} would be complete blocks)` : ''}.`,
      );
    const perReplicate = gardensPerReplicate(v, k);
    if (design === 'network') {
      if (siteIds.length < 2 * perReplicate)
        return problem(
          null,
          `With ${v} entries and ${k} to a garden, ${perReplicate} gardens grow every entry once: add gardens as sites until there are at least ${2 * perReplicate} (the trial has ${siteIds.length}), so each entry is grown in two or more.`,
        );
    } else if (!Number.isInteger(replicates) || replicates < 2)
      return problem('replicates', 'Incomplete blocks need at least 2 replicates.');
    else if (replicates * perReplicate > MAX_BLOCKS)
      return problem(
        'replicates',
        `${replicates} replicates of ${perReplicate} blocks make more than ${MAX_BLOCKS} blocks: use fewer replicates or larger blocks.`,
      );
  }
  const factor = input.factor ?? null;
  if (factor) {
    if (design === 'crd' || design === 'incomplete' || design === 'network')
      return problem(
        'factorName',
        'A second factor is laid out in complete blocks: choose randomized complete blocks (or blocks at several sites) in the settings first.',
      );
    if (factor.levels.length < 2)
      return problem('factorLevels', 'A treatment needs at least two levels.');
    if (new Set(factor.levels).size !== factor.levels.length)
      return problem('factorLevels', 'Each treatment level needs its own name.');
  }
  return null;
}

export function randomizeLayout(input: LayoutInput): PlannedPlot[] {
  const { design, entryIds, replicates, siteIds, seed } = input;
  const problem = layoutProblem(input);
  if (problem) throw new LayoutRefused(problem);
  const factor = input.factor ?? null;
  const random = createRandom(seed);
  if (design === 'incomplete' || design === 'network') return incompleteLayout(input, random);
  const plots: PlannedPlot[] = [];
  for (const siteId of siteIds) {
    if (factor) {
      plots.push(...twoFactorBlocks(random, siteId, entryIds, replicates, factor));
      continue;
    }
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
          treatment: null,
          mainPlot: null,
        }),
      );
      continue;
    }
    for (let block = 1; block <= replicates; block++) {
      random.shuffle(entryIds).forEach((entryId, i) =>
        plots.push({
          siteId,
          entryId,
          block,
          position: i + 1,
          plotNumber: plotNumberOf(block, i + 1, entryIds.length),
          treatment: null,
          mainPlot: null,
        }),
      );
    }
  }
  return plots;
}

/** The blocks of one site for a treatment × entry trial; positions run along the block. */
function twoFactorBlocks(
  random: ReturnType<typeof createRandom>,
  siteId: string,
  entryIds: readonly string[],
  replicates: number,
  factor: NonNullable<LayoutInput['factor']>,
): PlannedPlot[] {
  const perBlock = entryIds.length * factor.levels.length;
  const plots: PlannedPlot[] = [];
  let position = 0;
  const place = (block: number, treatment: string, entryId: string, mainPlot: number | null) => {
    position++;
    plots.push({
      siteId,
      entryId,
      block,
      position,
      plotNumber: plotNumberOf(block, position, perBlock),
      treatment,
      mainPlot,
    });
  };
  for (let block = 1; block <= replicates; block++) {
    position = 0;
    if (factor.arrangement === 'split_plot') {
      random.shuffle(factor.levels).forEach((treatment, m) => {
        for (const entryId of random.shuffle(entryIds)) place(block, treatment, entryId, m + 1);
      });
      continue;
    }
    const cells = factor.levels.flatMap((treatment) =>
      entryIds.map((entryId) => ({ treatment, entryId })),
    );
    for (const c of random.shuffle(cells)) place(block, c.treatment, c.entryId, null);
  }
  return plots;
}

function incompleteLayout(input: LayoutInput, random: ReturnType<typeof createRandom>) {
  const { design, entryIds, replicates, siteIds } = input;
  const v = entryIds.length;
  // layoutProblem has checked the block size, the gardens and the replicates.
  const k = input.blockSize!;
  const perReplicate = gardensPerReplicate(v, k);
  const plots: PlannedPlot[] = [];
  if (design === 'network') {
    // Each garden is one block; every full set of gardens grows every entry once.
    const full = Math.floor(siteIds.length / perReplicate);
    const plan = planIncompleteBlocks(v, k, full, random, siteIds.length % perReplicate);
    const gardens = random.shuffle(siteIds);
    let g = 0;
    plan.replicates.forEach((blocks, rep) =>
      blocks.forEach((block) => {
        const siteId = gardens[g++]!;
        block.forEach((e, i) =>
          plots.push({
            siteId,
            entryId: entryIds[e]!,
            block: 1,
            position: i + 1,
            plotNumber: plotNumberOf(1, i + 1, k),
            replicate: rep + 1,
            treatment: null,
            mainPlot: null,
          }),
        );
      }),
    );
    return plots;
  }
  const plan = planIncompleteBlocks(v, k, replicates, random);
  plan.replicates.forEach((blocks, rep) =>
    blocks.forEach((entries, b) => {
      const block = rep * perReplicate + b + 1;
      entries.forEach((e, i) =>
        plots.push({
          siteId: siteIds[0]!,
          entryId: entryIds[e]!,
          block,
          position: i + 1,
          plotNumber: plotNumberOf(block, i + 1, k),
          replicate: rep + 1,
          treatment: null,
          mainPlot: null,
        }),
      );
    }),
  );
  return plots;
}

/* ---------- The planting map: plots placed to scale, and a page to print them on ---------- */

export interface MapPlotInput {
  plotNumber: number;
  block: number;
  position: number;
}

export interface MapOptions {
  /** Plots side by side in one range (the entries per block). */
  plotsPerRange: number;
  rowLengthMm: number;
  rowSpacingMm: number;
  rowsPerPlot: number;
  /** Walkway between ranges. */
  alleyMm: number;
  /** Completely randomized plots all sit in block 1: wrap them into ranges of plotsPerRange. */
  wrapSingleBlock: boolean;
}

export interface MapPlotRect extends MapPlotInput {
  range: number;
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface MapGeometry {
  widthMm: number;
  heightMm: number;
  ranges: { range: number; block: number | null; y: number }[];
  plots: MapPlotRect[];
}

/**
 * Rows run top to bottom; a plot is `rowsPerPlot` rows wide and one row length long. Each
 * block is a range of plots across the field (position 1 on the left); ranges are stacked
 * with an alley between them. All coordinates in millimetres on the ground.
 */
export function mapGeometry(plots: readonly MapPlotInput[], o: MapOptions): MapGeometry {
  if (plots.length === 0) return { widthMm: 0, heightMm: 0, ranges: [], plots: [] };
  const perRange = Math.max(1, o.plotsPerRange);
  const plotWidth = o.rowsPerPlot * o.rowSpacingMm;
  const singleBlock = o.wrapSingleBlock && plots.every((p) => p.block === plots[0]!.block);
  const placed = plots.map((p) => {
    const range = singleBlock ? Math.ceil(p.position / perRange) : p.block;
    const column = singleBlock ? (p.position - 1) % perRange : p.position - 1;
    return { ...p, range, column };
  });
  const rangeNumbers = [...new Set(placed.map((p) => p.range))].sort((a, b) => a - b);
  const rangeY = new Map(rangeNumbers.map((r, i) => [r, i * (o.rowLengthMm + o.alleyMm)]));
  const columns = Math.max(...placed.map((p) => p.column + 1));
  return {
    widthMm: columns * plotWidth,
    heightMm: rangeNumbers.length * o.rowLengthMm + (rangeNumbers.length - 1) * o.alleyMm,
    ranges: rangeNumbers.map((range) => ({
      range,
      block: singleBlock ? null : range,
      y: rangeY.get(range)!,
    })),
    plots: placed.map(({ column, ...p }) => ({
      ...p,
      x: column * plotWidth,
      y: rangeY.get(p.range)!,
      width: plotWidth,
      height: o.rowLengthMm,
    })),
  };
}

/** Paper sizes in mm, portrait: ISO 216 A4 and ANSI Letter (8.5 × 11 in). */
export const paperSizes = {
  a4: { widthMm: 210, heightMm: 297, css: 'A4' },
  letter: { widthMm: 215.9, heightMm: 279.4, css: 'letter' },
} as const;
export type PaperSize = keyof typeof paperSizes;

export interface PageFit {
  orientation: 'portrait' | 'landscape';
  /** The printable box: the sheet less margins and the space kept for title and legend. */
  boxWidthMm: number;
  boxHeightMm: number;
  /** The drawing's size on paper, keeping its proportions. */
  drawingWidthMm: number;
  drawingHeightMm: number;
  /** One mm on paper is this many mm on the ground. */
  scale: number;
}

/**
 * Fits a drawing of the field onto one sheet: picks the orientation that prints it largest and
 * scales it to the printable box (sheet less `marginMm` all round and `reservedMm` below).
 */
export function fitToPage(
  widthMm: number,
  heightMm: number,
  paper: PaperSize,
  marginMm = 12,
  reservedMm = 60,
): PageFit {
  const sheet = paperSizes[paper];
  const options = (['portrait', 'landscape'] as const).map((orientation) => {
    const [w, h] =
      orientation === 'portrait'
        ? [sheet.widthMm, sheet.heightMm]
        : [sheet.heightMm, sheet.widthMm];
    const boxWidthMm = w - 2 * marginMm;
    const boxHeightMm = h - 2 * marginMm - reservedMm;
    const factor = Math.min(boxWidthMm / widthMm, boxHeightMm / heightMm);
    return {
      orientation,
      boxWidthMm,
      boxHeightMm,
      drawingWidthMm: widthMm * factor,
      drawingHeightMm: heightMm * factor,
      scale: 1 / factor,
    };
  });
  return options[0]!.scale <= options[1]!.scale ? options[0]! : options[1]!;
}
