/**
 * Linear mixed models fitted by restricted maximum likelihood (REML):
 *   y = Xβ + Σ_k Z_k u_k + e,  u_k ~ N(0, σ_k² I),  e ~ N(0, σ² I),
 * where each random term is a classification of the plots (garden, block within garden,
 * garden × variety, …) and X holds the fixed effects as cell means (one column per cell).
 *
 * The REML criterion is profiled over σ² and optimised over the relative standard deviations
 * θ_k = σ_k/σ, as the standard packages do, using the penalised system
 *   M(θ) = [ΛZ'ZΛ + I, ΛZ'X; X'ZΛ, X'X],  Λ = diag(θ),
 *   −2 REML log-likelihood = log|M(θ)| + (n − p)(1 + log(2π r²(θ)/(n − p))),
 * r² the penalised residual sum of squares. The deviance depends on θ only through θ², so the
 * search runs over all of ℝᴷ and a component at zero is an ordinary point (the boundary).
 *
 * Every classification (each random term, the fixed cells) has a diagonal block in M, so the
 * one with most levels is absorbed level by level; what is left is one small dense Cholesky
 * factorisation per evaluation.
 *
 * Denominator degrees of freedom for Wald tests by Satterthwaite's method as lmerTest
 * computes it: the asymptotic covariance of the variance parameters (θ, σ) is twice the
 * inverse Hessian of the REML deviance, and the gradient of Var(Lβ̂) comes from numerical
 * derivatives; a multi-degree-of-freedom F is split along the eigenvectors of L Var(β̂) L'.
 */
import { choleskyInPlace } from '../../../common/cholesky';
import { fUpperTail, studentTTwoSided } from './distributions.js';
import { hessian, jacobian } from './numeric-derivatives.js';
import { symmetricEigen } from './symmetric-eigen.js';

export interface RandomTerm {
  /** Name reported with its variance, e.g. "site", "site:block". */
  source: string;
  /** Level of each observation, 0 … levels − 1. */
  cells: Int32Array;
  levels: number;
}

export interface MixedModelInput {
  y: Float64Array;
  /**
   * The fixed effects as cell means of one classification (the variety, or the variety ×
   * treatment cell): β is one mean per cell, so X has full rank and X'X is diagonal.
   */
  fixedCells: Int32Array;
  fixedLevels: number;
  random: RandomTerm[];
}

/** Statistic for one linear combination or a set of them. */
export interface WaldTest {
  numDf: number;
  denDf: number;
  f: number;
  p: number;
}

export interface MixedFit {
  /** Relative standard deviations σ_k/σ at the optimum (≥ 0), in input order. */
  theta: number[];
  sigma2: number;
  varianceComponents: { source: string; variance: number; se: number | null }[];
  /** Fixed-effect estimates (BLUEs). */
  beta: Float64Array;
  /** Var(β̂), p × p row-major. */
  vcovBeta: Float64Array;
  /** Predicted random effects (BLUPs), one array per random term. */
  blups: Float64Array[];
  logLik: number;
  remlCriterion: number;
  /** True when a variance component was estimated as zero (θ_k below 1e-4). */
  boundary: boolean;
  /** Asymptotic covariance of (θ_1 … θ_K, σ) from the REML Hessian (row-major). */
  vcovVarpar: Float64Array;
  /** l'β̂ with its SE and Satterthwaite df. */
  contrast(l: ArrayLike<number>): { estimate: number; se: number; df: number };
  /** Wald F test of Lβ = 0 with Satterthwaite denominator df (lmerTest's method). */
  waldF(rows: readonly ArrayLike<number>[]): WaldTest;
}

interface Evaluation {
  deviance: number;
  /** Penalised residual sum of squares r²(θ). */
  r2: number;
  logdet: number;
  /** Cholesky factor of the absorbed system (rest × rest). */
  l: Float64Array;
  /** Forward-solved right-hand side L⁻¹ rhs. */
  c: Float64Array;
  /** Diagonal of the absorbed classification's block, per level. */
  d: Float64Array;
  /** Column scales (θ of the column's term, 1 for fixed). */
  s: Float64Array;
  /** Scale of the absorbed classification. */
  sa: number;
}

/**
 * Precomputed cross-products; everything per θ is cheap from here.
 *
 * The model's columns come in classifications: one per random term and the fixed cells. Each
 * plot lies in exactly one level of each, so any one classification's block of the system is
 * diagonal; the one with most levels is absorbed level by level and the others form a small
 * dense system ("rest": random terms first, fixed cells last when they are not absorbed).
 *
 * Absorbing level j subtracts w_j b_j b_j' (b_j its cross-products with the rest) with a weight
 * w_j = s_a²/(s_a² N_j + 1) that depends on θ only through the level's plot count N_j. So the
 * levels are summed once per distinct count (a handful: most levels hold the same number of
 * plots), and an evaluation is a few sparse updates, a scaling and one m × m Cholesky.
 */
class RemlProblem {
  readonly n: number;
  readonly p: number;
  readonly k: number;
  /** Absorbed classification: a random term's index, or k for the fixed cells. */
  readonly absorbed: number;
  /** First rest column of each classification (random terms 0…k−1, fixed k); −1 if absorbed. */
  readonly offset: number[];
  /** Size of the rest system. */
  readonly m: number;
  /** Lower triangle of the rest's cross-products (row-major m × m), its X'y part and y'y. */
  private readonly rest0: Float64Array;
  private readonly rhs0: Float64Array;
  private readonly yy: number;
  private readonly absN: Float64Array;
  private readonly absZy: Float64Array;
  /** Sparse rows of the absorbed classification's cross-products with the rest. */
  private readonly absCols: Int32Array[];
  private readonly absVals: Float64Array[];
  /** Classification of each rest column (k = fixed). */
  private readonly groupOf: Int32Array;
  /** Absorbed levels by plot count: the count, how many levels, the level's class. */
  private readonly classN: Float64Array;
  private readonly classLevels: Float64Array;
  private readonly classOf: Int32Array;
  /** Per class: Σ b_j b_j' (lower triangle, sparse positions), Σ b_j z_j'y, Σ (z_j'y)². */
  private readonly classPos: Int32Array[];
  private readonly classVal: Float64Array[];
  private readonly classRhsPos: Int32Array[];
  private readonly classRhsVal: Float64Array[];
  private readonly classYy: Float64Array;
  /** Scratch for the optimiser's evaluations (no allocation per θ). */
  private readonly scratchA: Float64Array;
  private readonly scratchRhs: Float64Array;
  private readonly scratchS: Float64Array;
  private readonly scratchD: Float64Array;

  constructor(readonly input: MixedModelInput) {
    const { y, random } = input;
    this.n = y.length;
    this.p = input.fixedLevels;
    this.k = random.length;
    const groups = [
      ...random.map((t) => ({ cells: t.cells, levels: t.levels })),
      { cells: input.fixedCells, levels: input.fixedLevels },
    ];
    let absorbed = 0;
    groups.forEach((g, i) => {
      if (g.levels > groups[absorbed]!.levels) absorbed = i;
    });
    this.absorbed = absorbed;
    let m = 0;
    this.offset = groups.map((g, i) => {
      if (i === absorbed) return -1;
      const o = m;
      m += g.levels;
      return o;
    });
    this.m = m;
    this.groupOf = new Int32Array(m);
    groups.forEach((g, i) => {
      if (i !== absorbed) for (let l = 0; l < g.levels; l++) this.groupOf[this.offset[i]! + l] = i;
    });

    const rest0 = new Float64Array(m * m);
    const rhs0 = new Float64Array(m);
    const abs = groups[absorbed]!;
    this.absN = new Float64Array(abs.levels);
    this.absZy = new Float64Array(abs.levels);
    const absRows: Map<number, number>[] = Array.from({ length: abs.levels }, () => new Map());
    let yy = 0;
    const cols = new Int32Array(groups.length);
    for (let i = 0; i < this.n; i++) {
      let nz = 0;
      groups.forEach((g, r) => {
        if (r !== absorbed) cols[nz++] = this.offset[r]! + g.cells[i]!;
      });
      const yi = y[i]!;
      yy += yi * yi;
      for (let a = 0; a < nz; a++) {
        rhs0[cols[a]!]! += yi;
        for (let b = 0; b < nz; b++) if (cols[b]! <= cols[a]!) rest0[cols[a]! * m + cols[b]!]! += 1;
      }
      const j = abs.cells[i]!;
      this.absN[j]! += 1;
      this.absZy[j]! += yi;
      const row = absRows[j]!;
      for (let a = 0; a < nz; a++) row.set(cols[a]!, (row.get(cols[a]!) ?? 0) + 1);
    }
    this.rest0 = rest0;
    this.rhs0 = rhs0;
    this.yy = yy;
    this.absCols = absRows.map((r) => Int32Array.from(r.keys()));
    this.absVals = absRows.map((r) => Float64Array.from(r.values()));

    // Levels with the same plot count share their absorption weight: sum them once.
    const classIndex = new Map<number, number>();
    this.classOf = new Int32Array(abs.levels);
    for (let j = 0; j < abs.levels; j++) {
      const count = this.absN[j]!;
      let c = classIndex.get(count);
      if (c === undefined) classIndex.set(count, (c = classIndex.size));
      this.classOf[j] = c;
    }
    const classes = classIndex.size;
    this.classN = Float64Array.from(classIndex.keys());
    this.classLevels = new Float64Array(classes);
    this.classYy = new Float64Array(classes);
    const outer: Map<number, number>[] = Array.from({ length: classes }, () => new Map());
    const rhsSum: Map<number, number>[] = Array.from({ length: classes }, () => new Map());
    for (let j = 0; j < abs.levels; j++) {
      const c = this.classOf[j]!;
      this.classLevels[c]! += 1;
      const zy = this.absZy[j]!;
      this.classYy[c]! += zy * zy;
      const cj = this.absCols[j]!;
      const vj = this.absVals[j]!;
      const sum = outer[c]!;
      const rs = rhsSum[c]!;
      for (let x = 0; x < cj.length; x++) {
        rs.set(cj[x]!, (rs.get(cj[x]!) ?? 0) + vj[x]! * zy);
        for (let z = 0; z < cj.length; z++) {
          if (cj[z]! > cj[x]!) continue;
          const pos = cj[x]! * m + cj[z]!;
          sum.set(pos, (sum.get(pos) ?? 0) + vj[x]! * vj[z]!);
        }
      }
    }
    this.classPos = outer.map((s) => Int32Array.from(s.keys()));
    this.classVal = outer.map((s) => Float64Array.from(s.values()));
    this.classRhsPos = rhsSum.map((s) => Int32Array.from(s.keys()));
    this.classRhsVal = rhsSum.map((s) => Float64Array.from(s.values()));
    this.scratchA = new Float64Array(m * m);
    this.scratchRhs = new Float64Array(m);
    this.scratchS = new Float64Array(m);
    this.scratchD = new Float64Array(classes);
  }

  /**
   * Builds and factors M(θ) with the absorbed classification taken out, into `a` (lower
   * Cholesky factor), `rhs` (forward-solved, L⁻¹ rhs), `s` (column scales) and `dc` (the
   * absorbed diagonal per count class); returns the deviance and its parts.
   */
  private factor(
    theta: readonly number[],
    a: Float64Array,
    rhs: Float64Array,
    s: Float64Array,
    dc: Float64Array,
  ): { deviance: number; r2: number; logdet: number; sa: number } {
    const { m, n, p, k } = this;
    for (let c = 0; c < m; c++) {
      const g = this.groupOf[c]!;
      s[c] = g === k ? 1 : theta[g]!;
    }
    a.set(this.rest0);
    rhs.set(this.rhs0);
    const fixedAbsorbed = this.absorbed === k;
    const sa = fixedAbsorbed ? 1 : theta[this.absorbed]!;
    const sa2 = sa * sa;
    let logdet = 0;
    let yy = this.yy;
    for (let c = 0; c < dc.length; c++) {
      const d = sa2 * this.classN[c]! + (fixedAbsorbed ? 0 : 1);
      dc[c] = d;
      logdet += this.classLevels[c]! * Math.log(d);
      if (sa2 === 0) continue;
      const w = sa2 / d;
      const pos = this.classPos[c]!;
      const val = this.classVal[c]!;
      for (let x = 0; x < pos.length; x++) a[pos[x]!]! -= w * val[x]!;
      const rp = this.classRhsPos[c]!;
      const rv = this.classRhsVal[c]!;
      for (let x = 0; x < rp.length; x++) rhs[rp[x]!]! -= w * rv[x]!;
      yy -= w * this.classYy[c]!;
    }
    for (let i = 0; i < m; i++) {
      const si = s[i]!;
      const row = i * m;
      for (let j = 0; j <= i; j++) a[row + j]! *= si * s[j]!;
      if (this.groupOf[i]! < k) a[row + i]! += 1;
      rhs[i]! *= si;
    }
    const ld = choleskyInPlace(a, m);
    let cc = 0;
    for (let i = 0; i < m; i++) {
      let v = rhs[i]!;
      const row = i * m;
      for (let q = 0; q < i; q++) v -= a[row + q]! * rhs[q]!;
      v /= a[row + i]!;
      rhs[i] = v;
      cc += v * v;
    }
    logdet += ld;
    // Guard against cancellation leaving a tiny negative residual.
    const r2 = Math.max(yy - cc, 1e-300);
    const nu = n - p;
    const deviance = logdet + nu * (1 + Math.log((2 * Math.PI * r2) / nu));
    return { deviance: Number.isFinite(ld) ? deviance : Infinity, r2, logdet, sa };
  }

  /** The profiled deviance and its parts, in scratch space (for the optimiser). */
  deviance(theta: readonly number[]): { deviance: number; r2: number; logdet: number } {
    return this.factor(theta, this.scratchA, this.scratchRhs, this.scratchS, this.scratchD);
  }

  /** A full evaluation whose arrays the caller keeps. */
  evaluate(theta: readonly number[]): Evaluation {
    const { m } = this;
    const l = new Float64Array(m * m);
    const c = new Float64Array(m);
    const s = new Float64Array(m);
    const dc = new Float64Array(this.classN.length);
    const { deviance, r2, logdet, sa } = this.factor(theta, l, c, s, dc);
    const d = new Float64Array(this.absN.length);
    for (let j = 0; j < d.length; j++) d[j] = dc[this.classOf[j]!]!;
    return { deviance, r2, logdet, l, c, d, s, sa };
  }

  /** REML deviance at given (θ, σ) — not profiled — as lmerTest defines it. */
  devianceAt(varpar: readonly number[]): number {
    const theta = varpar.slice(0, this.k);
    const sigma2 = varpar[this.k]! ** 2;
    const e = this.deviance(theta);
    return e.logdet + e.r2 / sigma2 + (this.n - this.p) * Math.log(2 * Math.PI * sigma2);
  }

  /** Var(β̂) = σ² × the fixed cells' block of M⁻¹. */
  vcovBeta(theta: readonly number[], sigma2: number, e = this.evaluate(theta)): Float64Array {
    const { m, p } = this;
    const v = new Float64Array(p * p);
    if (this.absorbed !== this.k) {
      // Fixed cells last in the rest: the inverse of the trailing block of the factor.
      const f0 = this.offset[this.k]!;
      const li = new Float64Array(p * p);
      for (let j = 0; j < p; j++) {
        li[j * p + j] = 1 / e.l[(f0 + j) * m + f0 + j]!;
        for (let i = j + 1; i < p; i++) {
          let s = 0;
          for (let q = j; q < i; q++) s -= e.l[(f0 + i) * m + f0 + q]! * li[q * p + j]!;
          li[i * p + j] = s / e.l[(f0 + i) * m + f0 + i]!;
        }
      }
      for (let i = 0; i < p; i++) {
        for (let j = 0; j <= i; j++) {
          let s = 0;
          for (let q = i; q < p; q++) s += li[q * p + i]! * li[q * p + j]!;
          v[i * p + j] = sigma2 * s;
          v[j * p + i] = sigma2 * s;
        }
      }
      return v;
    }
    // Fixed cells absorbed: D⁻¹ + D⁻¹ B' S⁻¹ B D⁻¹ with B the cross-products with the rest.
    const w = new Float64Array(p * m);
    for (let j = 0; j < p; j++) {
      const cols = this.absCols[j]!;
      const vals = this.absVals[j]!;
      const wj = j * m;
      let first = m;
      for (let z = 0; z < cols.length; z++) {
        w[wj + cols[z]!] = (e.s[cols[z]!]! * vals[z]!) / e.d[j]!;
        first = Math.min(first, cols[z]!);
      }
      // Forward substitution in place: W_j = L⁻¹ (B_j / D_j), zero above its first entry.
      for (let i = first; i < m; i++) {
        let t = w[wj + i]!;
        const row = i * m;
        for (let q = first; q < i; q++) t -= e.l[row + q]! * w[wj + q]!;
        w[wj + i] = t / e.l[row + i]!;
      }
    }
    for (let i = 0; i < p; i++) {
      const wi = i * m;
      for (let j = 0; j <= i; j++) {
        let s = i === j ? 1 / e.d[i]! : 0;
        const wj = j * m;
        for (let q = 0; q < m; q++) s += w[wi + q]! * w[wj + q]!;
        v[i * p + j] = sigma2 * s;
        v[j * p + i] = sigma2 * s;
      }
    }
    return v;
  }

  /** Solution of the full penalised system: β̂ (fixed cells) and the random effects (BLUPs). */
  solve(theta: readonly number[], e: Evaluation): { beta: Float64Array; blups: Float64Array[] } {
    const { m, k } = this;
    const x = new Float64Array(m);
    for (let i = m - 1; i >= 0; i--) {
      let v = e.c[i]!;
      for (let q = i + 1; q < m; q++) v -= e.l[q * m + i]! * x[q]!;
      x[i] = v / e.l[i * m + i]!;
    }
    // The absorbed classification from the rest: x_j = (s_a z'y_j − s_a Σ s_c b_jc x_c) / D_j.
    const absorbedX = new Float64Array(this.absN.length);
    for (let j = 0; j < absorbedX.length; j++) {
      let dot = 0;
      const cols = this.absCols[j]!;
      const vals = this.absVals[j]!;
      for (let z = 0; z < cols.length; z++) dot += e.s[cols[z]!]! * vals[z]! * x[cols[z]!]!;
      absorbedX[j] = (e.sa * (this.absZy[j]! - dot)) / e.d[j]!;
    }
    const groupX = (g: number, levels: number) =>
      g === this.absorbed ? absorbedX : x.slice(this.offset[g]!, this.offset[g]! + levels);
    const beta = groupX(k, this.p);
    const blups = this.input.random.map((t, r) => groupX(r, t.levels).map((b) => theta[r]! * b));
    return { beta, blups };
  }
}

/** Nelder–Mead on a small unconstrained problem, restarted until a restart gains nothing. */
function nelderMead(f: (x: number[]) => number, start: number[]): { x: number[]; f: number } {
  const k = start.length;
  let best = { x: [...start], f: f(start) };
  for (let restart = 0; restart < 20; restart++) {
    const simplex = [best.x];
    for (let i = 0; i < k; i++) {
      const v = [...best.x];
      v[i] =
        v[i]! + (Math.abs(v[i]!) > 1e-3 ? 0.1 * Math.abs(v[i]!) : 0.05) * (restart === 0 ? 2 : 1);
      simplex.push(v);
    }
    const fs = simplex.map(f);
    for (let iter = 0; iter < 2000 * k; iter++) {
      const order = fs.map((_, i) => i).sort((a, b) => fs[a]! - fs[b]!);
      const pts = order.map((i) => simplex[i]!);
      const vals = order.map((i) => fs[i]!);
      simplex.splice(0, simplex.length, ...pts);
      fs.splice(0, fs.length, ...vals);
      const spread = Math.abs(fs[k]! - fs[0]!);
      let size = 0;
      for (let i = 1; i <= k; i++)
        for (let j = 0; j < k; j++)
          size = Math.max(size, Math.abs(simplex[i]![j]! - simplex[0]![j]!));
      if (spread <= 1e-12 * (1 + Math.abs(fs[0]!)) && size < 1e-7) break;
      const centroid = new Array<number>(k).fill(0);
      for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) centroid[j]! += simplex[i]![j]! / k;
      const along = (t: number) => centroid.map((c, j) => c + t * (simplex[k]![j]! - c));
      const xr = along(-1);
      const fr = f(xr);
      if (fr < fs[0]!) {
        const xe = along(-2);
        const fe = f(xe);
        if (fe < fr) {
          simplex[k] = xe;
          fs[k] = fe;
        } else {
          simplex[k] = xr;
          fs[k] = fr;
        }
      } else if (fr < fs[k - 1]!) {
        simplex[k] = xr;
        fs[k] = fr;
      } else {
        const outside = fr < fs[k]!;
        const xc = along(outside ? -0.5 : 0.5);
        const fc = f(xc);
        if (fc < (outside ? fr : fs[k]!)) {
          simplex[k] = xc;
          fs[k] = fc;
        } else {
          for (let i = 1; i <= k; i++) {
            simplex[i] = simplex[i]!.map((v, j) => simplex[0]![j]! + 0.5 * (v - simplex[0]![j]!));
            fs[i] = f(simplex[i]!);
          }
        }
      }
    }
    let bi = 0;
    for (let i = 1; i <= k; i++) if (fs[i]! < fs[bi]!) bi = i;
    const gained = best.f - fs[bi]!;
    if (fs[bi]! <= best.f) best = { x: [...simplex[bi]!], f: fs[bi]! };
    if (restart > 0 && gained <= 1e-11 * (1 + Math.abs(best.f))) break;
  }
  return best;
}

/** θ below this (relative SD) is reported as a variance at the boundary (zero), as lme4 does. */
const BOUNDARY_THETA = 1e-4;

export function fitReml(input: MixedModelInput): MixedFit {
  const problem = new RemlProblem(input);
  const k = problem.k;
  const profiled = (theta: readonly number[]) => problem.deviance(theta).deviance;
  let opt = nelderMead((t) => profiled(t), new Array<number>(k).fill(1));
  let theta = opt.x.map(Math.abs);
  // A component near zero: fix it at zero and re-optimise the others; keep it there when the
  // deviance is no worse (a boundary optimum), as the bounded optimisers in the packages end.
  const small = theta.map((t, i) => (t < 1e-3 ? i : -1)).filter((i) => i >= 0);
  if (small.length > 0) {
    const free = theta.map((_, i) => i).filter((i) => !small.includes(i));
    const expand = (x: number[]) => {
      const full = new Array<number>(k).fill(0);
      free.forEach((i, j) => (full[i] = x[j]!));
      return full;
    };
    const sub =
      free.length > 0
        ? nelderMead(
            (x) => profiled(expand(x)),
            free.map((i) => theta[i]!),
          )
        : { x: [], f: profiled(expand([])) };
    if (sub.f <= opt.f + 1e-10 * (1 + Math.abs(opt.f))) {
      theta = expand(sub.x).map(Math.abs);
      opt = { x: theta, f: sub.f };
    }
  }
  const e = problem.evaluate(theta);
  const nu = problem.n - problem.p;
  const sigma2 = e.r2 / nu;
  const { beta, blups } = problem.solve(theta, e);
  const vcovBeta = problem.vcovBeta(theta, sigma2, e);
  const boundary = theta.some((t) => t < BOUNDARY_THETA);

  // Covariance of the variance parameters (θ, σ): 2 × pseudo-inverse of the REML Hessian,
  // eigenvalues within 1e-8 of zero left out (as lmerTest does).
  const varpar = [...theta, Math.sqrt(sigma2)];
  const q = varpar.length;
  const h = hessian((x) => problem.devianceAt(x), varpar);
  const eig = symmetricEigen(h, q);
  const vcovVarpar = new Float64Array(q * q);
  eig.values.forEach((val, mIdx) => {
    if (!(val > 1e-8)) return;
    const v = eig.vectors[mIdx]!;
    for (let i = 0; i < q; i++)
      for (let j = 0; j < q; j++) vcovVarpar[i * q + j]! += (2 * v[i]! * v[j]!) / val;
  });
  // ∂Var(β̂)/∂(θ_i, σ): one p × p matrix per variance parameter.
  const jac = jacobian((x) => problem.vcovBeta(x.slice(0, k), x[k]! ** 2), varpar);
  const p = problem.p;
  const qform = (l: ArrayLike<number>, mat: Float64Array) => {
    let s = 0;
    for (let i = 0; i < p; i++) {
      if (l[i] === 0) continue;
      let r = 0;
      for (let j = 0; j < p; j++) r += mat[i * p + j]! * l[j]!;
      s += l[i]! * r;
    }
    return s;
  };
  const satterthwaite = (l: ArrayLike<number>, variance: number) => {
    const g = jac.map((jm) => qform(l, jm));
    let gag = 0;
    for (let i = 0; i < q; i++)
      for (let j = 0; j < q; j++) gag += g[i]! * vcovVarpar[i * q + j]! * g[j]!;
    return (2 * variance * variance) / gag;
  };
  const dot = (l: ArrayLike<number>) => {
    let s = 0;
    for (let i = 0; i < p; i++) s += l[i]! * beta[i]!;
    return s;
  };

  const varianceComponents = input.random.map((t, i) => {
    // Delta method from (θ_i, σ) to σ_i² = θ_i² σ².
    const g = new Array<number>(q).fill(0);
    g[i] = 2 * theta[i]! * sigma2;
    g[k] = 2 * theta[i]! ** 2 * Math.sqrt(sigma2);
    return { source: t.source, variance: theta[i]! ** 2 * sigma2, se: deltaSe(g) };
  });
  const gRes = new Array<number>(q).fill(0);
  gRes[k] = 2 * Math.sqrt(sigma2);
  varianceComponents.push({ source: 'residual', variance: sigma2, se: deltaSe(gRes) });

  function deltaSe(g: number[]): number | null {
    let v = 0;
    for (let i = 0; i < q; i++)
      for (let j = 0; j < q; j++) v += g[i]! * vcovVarpar[i * q + j]! * g[j]!;
    return v > 0 ? Math.sqrt(v) : null;
  }

  return {
    theta,
    sigma2,
    varianceComponents,
    beta,
    vcovBeta,
    blups,
    logLik: -e.deviance / 2,
    remlCriterion: e.deviance,
    boundary,
    vcovVarpar,
    contrast(l) {
      const variance = qform(l, vcovBeta);
      return { estimate: dot(l), se: Math.sqrt(variance), df: satterthwaite(l, variance) };
    },
    waldF(rows) {
      const r = rows.length;
      // L Var(β̂) L' through Var(β̂) L' (p × r), so the work is 2p²r rather than p²r².
      const vl = new Float64Array(p * r);
      for (let b = 0; b < r; b++) {
        const lb = rows[b]!;
        for (let i = 0; i < p; i++) {
          let t = 0;
          const row = i * p;
          for (let j = 0; j < p; j++) t += vcovBeta[row + j]! * lb[j]!;
          vl[i * r + b] = t;
        }
      }
      const lvl = new Float64Array(r * r);
      for (let a = 0; a < r; a++) {
        const la = rows[a]!;
        for (let b = 0; b <= a; b++) {
          let t = 0;
          for (let i = 0; i < p; i++) t += la[i]! * vl[i * r + b]!;
          lvl[a * r + b] = t;
          lvl[b * r + a] = t;
        }
      }
      const eg = symmetricEigen(lvl, r);
      const tol = Math.max(Math.sqrt(2.220446049250313e-16) * eg.values[0]!, 0);
      const dirs: { l: Float64Array; d: number }[] = [];
      eg.values.forEach((d, mIdx) => {
        if (!(d > tol)) return;
        const pv = eg.vectors[mIdx]!;
        const l = new Float64Array(p);
        for (let a = 0; a < r; a++) for (let i = 0; i < p; i++) l[i]! += pv[a]! * rows[a]![i]!;
        dirs.push({ l, d });
      });
      const numDf = dirs.length;
      let f = 0;
      for (const { l, d } of dirs) f += dot(l) ** 2 / d;
      f /= numDf;
      const nus = dirs.map(({ l, d }) => satterthwaite(l, d));
      let denDf: number;
      if (nus.length === 1) denDf = nus[0]!;
      else if (nus.every((v) => Math.abs(v - nus[0]!) < 1e-8))
        denDf = nus.reduce((a, b) => a + b) / nus.length;
      else if (nus.some((v) => v <= 2)) denDf = 2;
      else {
        const sum = nus.reduce((acc, v) => acc + v / (v - 2), 0);
        denDf = (2 * sum) / (sum - nus.length);
      }
      return { numDf, denDf, f, p: fUpperTail(f, numDf, denDf) };
    },
  };
}

/**
 * Rows of the sequential (type I) hypothesis for columns from…to−1 of a model with cross-product
 * matrix X'X (p × p): the rows of the unit upper-triangular factor of X'X = U'DU (Gaussian
 * elimination without pivoting), the contrasts lmerTest builds for its F tests. A column
 * aliased with earlier ones gives no row.
 */
export function sequentialContrasts(
  xtx: Float64Array,
  p: number,
  from: number,
  to: number,
): Float64Array[] {
  const u = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = i; j < p; j++) {
      let s = xtx[i * p + j]!;
      for (let q = 0; q < i; q++) {
        const uqq = u[q * p + q]!;
        if (uqq !== 0) s -= (u[q * p + i]! * u[q * p + j]!) / uqq;
      }
      u[i * p + j] = s;
    }
    if (Math.abs(u[i * p + i]!) < 1e-6 * Math.max(1, xtx[i * p + i]!))
      for (let j = i; j < p; j++) u[i * p + j] = 0;
  }
  const rows: Float64Array[] = [];
  for (let i = from; i < to; i++) {
    const d = u[i * p + i]!;
    if (d === 0) continue;
    const row = new Float64Array(p);
    for (let j = i; j < p; j++) row[j] = u[i * p + j]! / d;
    rows.push(row);
  }
  return rows;
}

/**
 * The variety F test's contrasts on cell means, in the basis lmerTest uses: sequential rows for
 * the treatment-coded model (intercept, variety 2…k), mapped to the cell means m by
 * μ = m₁, τ_i = m_i − m₁. (The F statistic does not depend on the basis; Satterthwaite's df
 * for a multi-df test does, so the basis is the packages'.)
 */
export function varietyTestContrasts(counts: ArrayLike<number>): Float64Array[] {
  const k = counts.length;
  const xtx = new Float64Array(k * k);
  let total = 0;
  for (let i = 0; i < k; i++) total += counts[i]!;
  xtx[0] = total;
  for (let i = 1; i < k; i++) {
    xtx[i] = counts[i]!;
    xtx[i * k] = counts[i]!;
    xtx[i * k + i] = counts[i]!;
  }
  return sequentialContrasts(xtx, k, 1, k).map((row) => {
    const cell = new Float64Array(k);
    cell[0] = row[0]!;
    for (let i = 1; i < k; i++) {
      cell[i] = row[i]!;
      cell[0] -= row[i]!;
    }
    return cell;
  });
}

/** Two-sided p of a contrast's t on its Satterthwaite df. */
export function contrastP(estimate: number, se: number, df: number): number {
  return studentTTwoSided(estimate / se, df);
}
