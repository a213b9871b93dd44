/**
 * Helpers for the NIST StRD one-way ANOVA reference sets
 * (https://www.itl.nist.gov/div898/strd/anova/anova.html): unchanged copies of NIST's files in
 * fixtures/analysis/nist-strd-anova (its README.md names the source).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');
export const nistDir = path.resolve(repoRoot, 'fixtures/analysis/nist-strd-anova');

export interface NistSet {
  name: string;
  observations: number;
  data: { level: string; response: string }[];
  certified: {
    betweenDf: number;
    betweenSs: number;
    betweenMs: number;
    f: number;
    withinDf: number;
    withinSs: number;
    withinMs: number;
    rSquared: number;
    residualSd: number;
  };
}

const NUM = String.raw`([-+]?\d\.\d+E[-+]\d+)`;

export function readNistSet(file: string): NistSet {
  const text = readFileSync(path.join(nistDir, file), 'utf8');
  const lines = text.split(/\r?\n/);
  // Find the certified table by its text (the stated line numbers can be off by one).
  const between = lines.find((l) => /^\s*Between\s/.test(l));
  const within = lines.find((l) => /^\s*Within\s/.test(l));
  const rsq = new RegExp(`Certified R-Squared\\s+${NUM}`).exec(text);
  const sd = new RegExp(`Standard Deviation\\s+${NUM}`).exec(text);
  const obs = /(\d+)\s+Observations/.exec(text);
  if (!between || !within || !rsq || !sd || !obs)
    throw new Error(`${file}: certified values not found`);
  const b = new RegExp(String.raw`(\d+)\s+${NUM}\s+${NUM}\s+${NUM}\s*$`).exec(between);
  const w = new RegExp(String.raw`(\d+)\s+${NUM}\s+${NUM}\s*$`).exec(within);
  if (!b || !w) throw new Error(`${file}: certified rows unreadable`);
  // Data follow the last "Data:" line.
  let start = -1;
  lines.forEach((l, i) => {
    if (/^Data:/.test(l)) start = i + 1;
  });
  const data = lines
    .slice(start)
    .map((l) => l.trim())
    .filter((l) => l !== '')
    .map((l) => {
      const [level, response] = l.split(/\s+/);
      return { level: level!, response: response! };
    });
  return {
    name: file.replace(/\.dat$/, ''),
    observations: Number(obs[1]),
    data,
    certified: {
      betweenDf: Number(b[1]),
      betweenSs: Number(b[2]),
      betweenMs: Number(b[3]),
      f: Number(b[4]),
      withinDf: Number(w[1]),
      withinSs: Number(w[2]),
      withinMs: Number(w[3]),
      rSquared: Number(rsq[1]),
      residualSd: Number(sd[1]),
    },
  };
}

/** Log relative error as NIST StRD uses it, capped at the 15 certified digits. */
export function lre(computed: number, certified: number): number {
  if (computed === certified) return 15;
  const rel = Math.abs(computed - certified) / Math.abs(certified);
  return Math.min(15, -Math.log10(rel));
}
