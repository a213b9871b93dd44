/**
 * Resolvable incomplete-block plans: each replicate holds every entry once, split into blocks of
 * k (or k − 1 when k does not divide the number of entries), so no block needs room for all the
 * entries. Used for a field too long for complete blocks, and for a network of gardens where
 * each garden is one block ("each volunteer grows k entries").
 *
 * The plan is built replicate by replicate from the stored seed: each replicate starts as a
 * random partition and entries are swapped between its blocks while that lowers the sum of
 * cubed pair concurrences (how often two entries share a block). With the total of the
 * concurrences fixed by v, k and r, a convex penalty is smallest for the most even spread, the
 * property alpha designs are built for; cubes rather than squares also tell apart two spreads of
 * equal variance by their largest concurrence. Random restarts per replicate, and of the whole
 * plan, keep the best. Pure: no I/O.
 */
import { traceOfSpdInverse } from './cholesky';
import type { Random } from './random';

export interface IncompleteBlockPlan {
  /** blocks[replicate][block] = entry indices (0 … v − 1), in planting order. */
  replicates: number[][][];
}

/** Blocks per replicate and their sizes: v entries in ⌈v/k⌉ blocks whose sizes differ by at most one. */
export function blockSizes(entries: number, blockSize: number): number[] {
  const s = Math.ceil(entries / blockSize);
  const base = Math.floor(entries / s);
  const larger = entries - base * s;
  return Array.from({ length: s }, (_, i) => (i < larger ? base + 1 : base));
}

const RESTARTS = 10;
/** Whole-plan attempts: fewer for large trials, whose plans take longer and vary less. */
const planAttempts = (entries: number) => (entries <= 40 ? 8 : 3);

/** Penalty of a pair that meets c times; what one more meeting adds is penalty(c + 1) − penalty(c). */
const penalty = (c: number) => c * c * c;
const step = (earlier: number) => penalty(earlier + 1) - penalty(earlier);

/**
 * Plans `replicates` full replicates of `entries` entries in blocks of at most `blockSize`,
 * then `extraBlocks` more blocks (fewer than one replicate, e.g. gardens beyond the last full
 * replicate) filled from a further, partial replicate.
 */
export function planIncompleteBlocks(
  entries: number,
  blockSize: number,
  replicates: number,
  random: Random,
  extraBlocks = 0,
): IncompleteBlockPlan {
  if (!Number.isInteger(blockSize) || blockSize < 2 || blockSize >= entries)
    throw new Error(`A block holds from 2 to ${entries - 1} of the ${entries} entries.`);
  const sizes = blockSizes(entries, blockSize);
  if (!Number.isInteger(extraBlocks) || extraBlocks < 0 || extraBlocks >= sizes.length)
    throw new Error('Extra blocks must be fewer than one replicate.');
  let best: { plan: number[][][]; score: number } | null = null;
  for (let attempt = 0; attempt < planAttempts(entries); attempt++) {
    const plan = onePlan(entries, sizes, replicates, extraBlocks, random);
    const together = concurrences(plan.flat(), entries);
    let score = 0;
    for (let a = 0; a < entries; a++)
      for (let b = a + 1; b < entries; b++) score += penalty(together[a * entries + b]!);
    if (!best || score < best.score) best = { plan, score };
  }
  // Randomize the order of blocks within each replicate and of entries within each block.
  return {
    replicates: best!.plan.map((blocks) => random.shuffle(blocks).map((b) => random.shuffle(b))),
  };
}

function onePlan(
  entries: number,
  sizes: number[],
  replicates: number,
  extraBlocks: number,
  random: Random,
): number[][][] {
  const together = new Int32Array(entries * entries);
  const plan: number[][][] = [];
  const reps = replicates + (extraBlocks > 0 ? 1 : 0);
  for (let rep = 0; rep < reps; rep++) {
    const partial = rep === replicates;
    let best: number[][] | null = null;
    let bestScore = Infinity;
    for (let attempt = 0; attempt < RESTARTS; attempt++) {
      const blocks = improvePartition(
        cut(random.shuffle(range(entries)), sizes),
        together,
        entries,
      );
      // A partial replicate keeps only its first blocks: score those alone.
      const kept = partial ? bestSubset(blocks, extraBlocks, together, entries) : blocks;
      const score = addedPenalty(kept, together, entries);
      if (score < bestScore) {
        bestScore = score;
        best = kept;
      }
      // Replicate 1 meets an empty concurrence table: every partition is as good.
      if (rep === 0) break;
    }
    for (const block of best!) addConcurrences(block, together, entries, 1);
    plan.push(best!);
  }
  return plan;
}

const range = (n: number) => Array.from({ length: n }, (_, i) => i);

function cut(order: number[], sizes: number[]): number[][] {
  const out: number[][] = [];
  let at = 0;
  for (const size of sizes) {
    out.push(order.slice(at, at + size));
    at += size;
  }
  return out;
}

function addConcurrences(block: number[], together: Int32Array, v: number, by: number) {
  for (let a = 0; a < block.length; a++)
    for (let b = a + 1; b < block.length; b++) {
      together[block[a]! * v + block[b]!]! += by;
      together[block[b]! * v + block[a]!]! += by;
    }
}

/** What these blocks add to the penalty on top of the earlier concurrences. */
function addedPenalty(blocks: number[][], together: Int32Array, v: number): number {
  let s = 0;
  for (const block of blocks)
    for (let a = 0; a < block.length; a++)
      for (let b = a + 1; b < block.length; b++) s += step(together[block[a]! * v + block[b]!]!);
  return s;
}

/** What entry x adds to the penalty by joining `block` (leaving out `skip`). */
function joinCost(x: number, block: number[], skip: number, together: Int32Array, v: number) {
  let s = 0;
  for (const y of block) if (y !== skip && y !== x) s += step(together[x * v + y]!);
  return s;
}

/** Swaps entries between blocks while a swap lowers the penalty. */
function improvePartition(blocks: number[][], together: Int32Array, v: number): number[][] {
  let improved = true;
  while (improved) {
    improved = false;
    for (let i = 0; i < blocks.length; i++)
      for (let j = i + 1; j < blocks.length; j++) {
        const A = blocks[i]!;
        const B = blocks[j]!;
        for (let a = 0; a < A.length; a++)
          for (let b = 0; b < B.length; b++) {
            const x = A[a]!;
            const y = B[b]!;
            const now = joinCost(x, A, x, together, v) + joinCost(y, B, y, together, v);
            const swapped = joinCost(x, B, y, together, v) + joinCost(y, A, x, together, v);
            if (swapped < now) {
              A[a] = y;
              B[b] = x;
              improved = true;
            }
          }
      }
  }
  return blocks;
}

/** The `count` blocks of a partition that add the least penalty. */
function bestSubset(blocks: number[][], count: number, together: Int32Array, v: number) {
  const scored = blocks
    .map((b) => ({ b, score: addedPenalty([b], together, v) }))
    .sort((p, q) => p.score - q.score);
  return scored.slice(0, count).map((p) => p.b);
}

/* ---------- Properties of a plan ---------- */

export interface ConcurrenceSummary {
  /** Fewest and most blocks any two entries share. */
  min: number;
  max: number;
  /** How many pairs share a block 0, 1, 2 … times. */
  histogram: number[];
}

/** Pair concurrences of entries 0 … v − 1 over a list of blocks. */
export function concurrences(blocks: readonly (readonly number[])[], v: number): Int32Array {
  const together = new Int32Array(v * v);
  for (const block of blocks) addConcurrences([...block], together, v, 1);
  return together;
}

export function summarizeConcurrences(
  blocks: readonly (readonly number[])[],
  v: number,
): ConcurrenceSummary {
  const together = concurrences(blocks, v);
  let min = Infinity;
  let max = 0;
  const histogram: number[] = [];
  for (let a = 0; a < v; a++)
    for (let b = a + 1; b < v; b++) {
      const c = together[a * v + b]!;
      min = Math.min(min, c);
      max = Math.max(max, c);
      histogram[c] = (histogram[c] ?? 0) + 1;
    }
  for (let i = 0; i < histogram.length; i++) histogram[i] ??= 0;
  return { min: v < 2 ? 0 : min, max, histogram };
}

/**
 * The efficiency factor of an equireplicate block design: the harmonic mean of the non-zero
 * eigenvalues of C/r, where C = rI − N K⁻¹ Nᵀ is the information matrix of the intra-block
 * analysis (1 for complete blocks, v(k − 1)/((v − 1)k) for a balanced incomplete-block design).
 * Null when entries are unequally replicated or the design is not connected.
 */
export function efficiencyFactor(blocks: readonly (readonly number[])[], v: number): number | null {
  const reps = new Float64Array(v);
  for (const b of blocks) for (const e of b) reps[e]! += 1;
  const r = reps[0]!;
  if (r === 0 || reps.some((x) => x !== r)) return null;
  // M = C/r + J/v is non-singular exactly when the design is connected; the trace of its inverse
  // is Σ 1/μᵢ over the non-zero eigenvalues μᵢ of C/r, plus 1 for the direction of the ones vector.
  const m = new Float64Array(v * v);
  for (let i = 0; i < v; i++) m[i * v + i] = 1;
  for (const b of blocks) {
    const k = b.length;
    for (const x of b) for (const y of b) m[x * v + y]! -= 1 / (r * k);
  }
  for (let i = 0; i < v * v; i++) m[i]! += 1 / v;
  const traceInverse = traceOfSpdInverse(m, v);
  if (traceInverse === null) return null;
  return (v - 1) / (traceInverse - 1);
}

/** The properties of a laid-out plan, read back from its plots. */
export function describePlan(
  plots: readonly { block: string; entry: string; replicate: number | null }[],
  entryKeys: readonly string[],
) {
  const index = new Map(entryKeys.map((e, i) => [e, i]));
  const byBlock = new Map<string, number[]>();
  const replicateBlocks = new Map<number, Set<string>>();
  for (const p of plots) {
    const e = index.get(p.entry);
    if (e === undefined) continue;
    let block = byBlock.get(p.block);
    if (!block) byBlock.set(p.block, (block = []));
    block.push(e);
    if (p.replicate !== null) {
      let set = replicateBlocks.get(p.replicate);
      if (!set) replicateBlocks.set(p.replicate, (set = new Set()));
      set.add(p.block);
    }
  }
  const blocks = [...byBlock.values()];
  const v = entryKeys.length;
  const reps = new Array<number>(v).fill(0);
  for (const b of blocks) for (const e of b) reps[e]! += 1;
  // A full replicate holds every entry once.
  let fullReplicates = 0;
  for (const keys of replicateBlocks.values()) {
    const held = [...keys].flatMap((k) => byBlock.get(k)!);
    if (held.length === v && new Set(held).size === v) fullReplicates += 1;
  }
  const summary = summarizeConcurrences(blocks, v);
  const sizes = blocks.map((b) => b.length);
  return {
    blocks: blocks.length,
    fullReplicates,
    smallestBlock: Math.min(...sizes),
    largestBlock: Math.max(...sizes),
    concurrenceMin: summary.min,
    concurrenceMax: summary.max,
    concurrenceCounts: summary.histogram,
    replicationMin: Math.min(...reps),
    replicationMax: Math.max(...reps),
    efficiency: efficiencyFactor(blocks, v),
  };
}
