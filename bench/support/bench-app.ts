/**
 * What the server benchmarks share: a throwaway PostgreSQL cluster (no fsync, like the tests'),
 * the production server as built (`node dist/server/main.js`) in a process of its own so the
 * load generator does not share its event loop, a lead signed in through the real sign-in
 * endpoint, and fictional trials written straight into the database.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import { createDb, createPool, type DB } from '../../db/database';
import { createDatabaseIfMissing } from '../../db/ensure-database';
import { migrateToLatest } from '../../db/migrator';
import { startPg, stopPg } from '../../db/pg-server';
import { projectRoot } from '../../server/env';
import { installMailQueue } from '../../server/mail/mail-queue';
import { createUser } from '../../tests/support/test-app';

/** This engineer's ports: the app and the throwaway cluster. */
export const BENCH_PORT = Number(process.env.BENCH_PORT ?? 3380);
export const BENCH_DB_PORT = Number(process.env.BENCH_DB_PORT ?? 55380);
export const BENCH_ORIGIN = `http://127.0.0.1:${BENCH_PORT}`;

export interface BenchDatabase {
  url: string;
  /** The cluster's folder (its server.log is there). */
  dataDir: string;
  db: DB;
  stop(): Promise<void>;
}

export async function startBenchDatabase(): Promise<BenchDatabase> {
  const base = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-bench-'));
  if (process.getuid?.() === 0) execFileSync('chown', ['postgres:postgres', base]);
  const dataDir = path.join(base, 'pg');
  const server = await startPg({ dataDir, port: BENCH_DB_PORT, throwaway: true, log: () => {} });
  await createDatabaseIfMissing(server.url(), 'rowtally_bench');
  const url = server.url('rowtally_bench');
  const pool = createPool(url, 20);
  const db = createDb(pool);
  await migrateToLatest(db);
  await installMailQueue(pool);
  return {
    url,
    dataDir,
    db,
    async stop() {
      await db.destroy();
      stopPg(dataDir, () => {});
      fs.rmSync(base, { recursive: true, force: true });
    },
  };
}

/** Builds the server bundle as `npm start` runs it. */
export function buildServer(): void {
  execFileSync('npm', ['run', '--silent', 'build:server'], { cwd: projectRoot, stdio: 'inherit' });
}

export interface BenchServer {
  origin: string;
  stop(): Promise<void>;
}

/** The production server on BENCH_PORT, started and waited for. */
export async function startBenchServer(
  databaseUrl: string,
  env: Record<string, string> = {},
): Promise<BenchServer> {
  const uploadsDir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-bench-uploads-'));
  const child: ChildProcess = spawn(
    process.execPath,
    // BENCH_NODE_ARGS="--cpu-prof --cpu-prof-dir=/tmp/prof" profiles the server under load.
    [
      ...(process.env.BENCH_NODE_ARGS?.split(' ').filter(Boolean) ?? []),
      path.join(projectRoot, 'dist/server/main.js'),
    ],
    {
      cwd: projectRoot,
      env: {
        ...process.env,
        DATABASE_URL: databaseUrl,
        PORT: String(BENCH_PORT),
        HOST: '127.0.0.1',
        PUBLIC_URL: BENCH_ORIGIN,
        AUTH_SECRET: 'bench-secret-not-for-use-anywhere-else-0123456789',
        MAIL_DRIVER: 'off',
        // Request lines are logged in production; a benchmark measures the app, not the log pipe.
        LOG_LEVEL: 'warn',
        ANALYSIS_RATE_PER_MINUTE: '100000',
        UPLOADS_DIR: uploadsDir,
        ...env,
      },
      stdio: ['ignore', 'pipe', 'inherit'],
    },
  );
  await new Promise<void>((resolve, reject) => {
    child.once('exit', (code) => reject(new Error(`the server stopped (${code})`)));
    child.stdout!.on('data', (chunk: Buffer) => {
      if (chunk.toString().includes('listening')) resolve();
    });
  });
  child.removeAllListeners('exit');
  return {
    origin: BENCH_ORIGIN,
    stop: () =>
      new Promise<void>((resolve) => {
        child.once('exit', () => {
          fs.rmSync(uploadsDir, { recursive: true, force: true });
          resolve();
        });
        child.kill('SIGTERM');
      }),
  };
}

/** A verified lead, signed in through the real endpoint; returns the Cookie header. */
export async function signedInLead(
  db: DB,
  origin: string,
): Promise<{ userId: string; cookie: string }> {
  const id = crypto.randomUUID().slice(0, 8);
  const lead = await createUser(db, { name: 'Bench Lead', email: `lead-${id}@bench.example` });
  const res = await fetch(`${origin}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: origin },
    body: JSON.stringify({ email: lead.email, password: lead.password }),
  });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
  return { userId: lead.id, cookie };
}

export interface BenchTrial {
  trialId: string;
  slug: string;
  plotIds: string[];
}

/**
 * A multisite trial of invented varieties, `entries` × `blocks` × `sites` plots, led by
 * `leadId`, with a harvest mass trait and `harvestsPerPlot` marketable pickings per plot.
 */
export async function insertBenchTrial(
  db: DB,
  opts: {
    slug: string;
    leadId: string;
    entries: number;
    blocks: number;
    sites: number;
    harvestsPerPlot: number;
  },
): Promise<BenchTrial> {
  const { id: trialId } = await db
    .insertInto('trials')
    .values({
      slug: opts.slug,
      title: `Bench trial ${opts.slug}`,
      crop: 'tomato',
      season: '2026',
      design: 'multisite',
      status: 'active',
      created_by: opts.leadId,
      updated_by: opts.leadId,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  await db
    .insertInto('trial_members')
    .values({ trial_id: trialId, user_id: opts.leadId, role: 'lead' })
    .execute();
  const sites = await db
    .insertInto('sites')
    .values(
      Array.from({ length: opts.sites }, (_, s) => ({
        trial_id: trialId,
        name: `Plot ground ${s + 1}`,
      })),
    )
    .returning('id')
    .execute();
  const entries = await db
    .insertInto('entries')
    .values(
      Array.from({ length: opts.entries }, (_, i) => ({
        trial_id: trialId,
        name: `Bench variety ${i + 1}`,
        code: `B${i + 1}`,
        entry_type: 'heirloom' as const,
      })),
    )
    .returning('id')
    .execute();
  await db
    .insertInto('traits')
    .values({
      trial_id: trialId,
      key: 'yield',
      label: 'Marketable yield',
      quantity_kind: 'mass',
      basis: 'harvest',
      direction: 'higher',
      scale_min: null,
      scale_max: null,
    })
    .execute();
  const plotValues = sites.flatMap((site, s) =>
    Array.from({ length: opts.blocks }, (_, b) =>
      entries.map((entry, i) => ({
        trial_id: trialId,
        site_id: site.id,
        entry_id: entry.id,
        block: b + 1,
        position: i + 1,
        plot_number: (s + 1) * 10_000 + (b + 1) * 1000 + i + 1,
      })),
    ).flat(),
  );
  const plotIds: string[] = [];
  for (let i = 0; i < plotValues.length; i += 1000) {
    const rows = await db
      .insertInto('plots')
      .values(plotValues.slice(i, i + 1000))
      .returning('id')
      .execute();
    plotIds.push(...rows.map((r) => r.id));
  }
  // Pickings through the season; masses from a fixed formula so every run has the same data.
  await sql`
    insert into harvests (trial_id, plot_id, harvested_on, fruit_count, mass_g, grade, created_by, updated_by)
    select ${trialId}, p.id, date '2026-07-01' + (k % 60), 1 + (k % 5),
           200 + ((p.plot_number * 37 + k * 11) % 400), 'marketable', ${opts.leadId}, ${opts.leadId}
    from plots p cross join generate_series(1, ${opts.harvestsPerPlot}) as k
    where p.trial_id = ${trialId}`.execute(db);
  // As autovacuum leaves a table some time after a bulk load: statistics and the visibility map
  // (index-only scans read the index alone only for pages marked all-visible).
  await sql`vacuum analyze harvests`.execute(db);
  return { trialId, slug: opts.slug, plotIds };
}

/** p-th quantile of sorted values. */
export function percentile(sorted: number[], p: number): number {
  const i = Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1);
  return sorted[Math.max(0, i)]!;
}

export const median = (xs: number[]) =>
  percentile(
    [...xs].sort((a, b) => a - b),
    0.5,
  );

/** The one last line every benchmark prints. */
export function verdict(name: string, ratio: number, target: number, atMost: boolean): string {
  const met = atMost ? ratio <= target : ratio >= target;
  return `${name}: ratio ${ratio.toFixed(2)} (target ${target}) ${met ? 'met' : 'NOT met'}`;
}

/**
 * The closing line of a benchmark with several verdicts: how many were met, out of all of them
 * ("… NOT met" also ends in " met", so a met line is one whose verdict follows the target).
 */
export function closingVerdict(name: string, lines: string[], alsoHolds = true): string {
  const met = lines.filter((l) => l.endsWith(') met')).length;
  const all = met === lines.length && alsoHolds;
  return `${name}: ratio ${met}/${lines.length} targets (target ${lines.length}/${lines.length}) ${all ? 'met' : 'NOT met'}`;
}
