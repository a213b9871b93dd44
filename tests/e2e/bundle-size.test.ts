/**
 * What a phone downloads before the sign-in page or a public results sheet can show: the app's
 * entry and the page's own chunk with everything they import, gzip-compressed as the server
 * sends them. Read from the build's manifest (Vite writes it beside the built client).
 * The 170 kB budget is ours (common practice, no source: roughly what a mid-range phone on a
 * weak mobile signal loads in a few seconds).
 */
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { defaultClientDir } from '../../server/app';

const BUDGET_BYTES = 170 * 1024;

interface Chunk {
  file: string;
  isEntry?: boolean;
  imports?: string[];
  dynamicImports?: string[];
}
const manifest = JSON.parse(
  fs.readFileSync(path.join(defaultClientDir, '.vite', 'manifest.json'), 'utf8'),
) as Record<string, Chunk>;

/** The chunks loaded before a page shows: the entry, the page, and their static imports. */
function firstLoad(page: string): string[] {
  const seen = new Set<string>();
  const visit = (key: string) => {
    if (seen.has(key)) return;
    const chunk = manifest[key];
    if (!chunk) throw new Error(`not in the build: ${key}`);
    seen.add(key);
    for (const dep of chunk.imports ?? []) visit(dep);
  };
  visit(Object.keys(manifest).find((k) => manifest[k]!.isEntry)!);
  visit(page);
  return [...seen].map((k) => manifest[k]!.file);
}

const gzipped = (files: string[]) =>
  files.reduce(
    (sum, f) => sum + zlib.gzipSync(fs.readFileSync(path.join(defaultClientDir, f))).length,
    0,
  );

describe('JavaScript loaded before a page shows', () => {
  for (const [name, page] of [
    ['the sign-in page', 'src/features/auth/routes/sign-in-route.tsx'],
    ['a public results sheet', 'src/features/results/routes/public-sheet-route.tsx'],
  ] as const) {
    it(`stays within ${BUDGET_BYTES / 1024} kB gzip for ${name}, with no chart or PDF code`, () => {
      const files = firstLoad(page);
      const size = gzipped(files);
      console.log(`${name}: ${(size / 1024).toFixed(1)} kB gzip in ${files.length} files`);
      expect(size).toBeLessThanOrEqual(BUDGET_BYTES);
      // Chart and PDF libraries are loaded only by the pages that draw or print them.
      const sources = files.map((f) => fs.readFileSync(path.join(defaultClientDir, f), 'utf8'));
      expect(sources.some((s) => s.includes('recharts'))).toBe(false);
      expect(sources.some((s) => /pdfkit|jspdf/.test(s))).toBe(false);
    });
  }
});
