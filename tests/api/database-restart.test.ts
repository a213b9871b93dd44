/**
 * The app outlives its database server: a PostgreSQL cluster of this file's own (so no other
 * test file notices) is crashed (`pg_ctl stop -m immediate`) and shut down (`-m fast`, which
 * ends every session with 57P01) while writers are creating trials. The process must keep
 * running, say 503 from /api/health while the server is away, answer again as soon as it is
 * back, and keep every write it acknowledged.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import pino from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDb, createPool, type DB } from '../../db/database';
import { createDatabaseIfMissing } from '../../db/ensure-database';
import { migrateToLatest } from '../../db/migrator';
import { freePort, startPg, stopPg } from '../../db/pg-server';
import { parseEnv } from '../../server/env';
import { createRuntime, type Runtime } from '../../server/runtime';
import { createUser, mintSessionCookie, TEST_ORIGIN } from '../support/test-app';

let base: string;
let dataDir: string;
let port: number;
let runtime: Runtime;
let server: ReturnType<Runtime['app']['listen']>;
let url: string;
let cookie: string;
let check: DB;

async function startCluster() {
  // Durable settings (fsync, synchronous commit), as a real season's server runs.
  await startPg({ dataDir, port, log: () => {} });
}

beforeAll(async () => {
  base = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-restart-'));
  if (process.getuid?.() === 0) execFileSync('chown', ['postgres:postgres', base]);
  dataDir = path.join(base, 'pg');
  port = await freePort();
  await startCluster();
  const serverUrl = `postgres://app@127.0.0.1:${port}/postgres`;
  await createDatabaseIfMissing(serverUrl, 'rowtally');
  const databaseUrl = `postgres://app@127.0.0.1:${port}/rowtally`;
  const migrating = createDb(createPool(databaseUrl, 1));
  await migrateToLatest(migrating);
  await migrating.destroy();

  const env = parseEnv({ NODE_ENV: 'test', LOG_LEVEL: 'silent', UPLOADS_DIR: base });
  const logger = pino({ level: 'silent' });
  runtime = createRuntime({
    env,
    databaseUrl,
    logger,
    mailer: { send: async () => {} },
    baseUrl: TEST_ORIGIN,
    clientDir: '/nonexistent',
  });
  const user = await createUser(runtime.db);
  cookie = await mintSessionCookie({ runtime, db: runtime.db }, user);
  server = runtime.app.listen(0, '127.0.0.1');
  // Longer than the client's own keep-alive, so a reused connection is never cut under it.
  server.keepAliveTimeout = 60_000;
  await new Promise((resolve) => server.once('listening', resolve));
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  check = createDb(createPool(databaseUrl, 1));
}, 60_000);

afterAll(async () => {
  server?.closeAllConnections();
  await new Promise((resolve) => server?.close(resolve));
  await check?.destroy().catch(() => {});
  await runtime?.close().catch(() => {});
  if (dataDir) stopPg(dataDir, () => {}, 'immediate');
  if (base) fs.rmSync(base, { recursive: true, force: true });
});

async function health(): Promise<number> {
  return (await fetch(`${url}/api/health`)).status;
}

/** Writers creating trials until told to stop; each 201 is a write the app acknowledged. */
function startWriters(count: number) {
  const acknowledged: string[] = [];
  const statuses = new Map<number, number>();
  let running = true;
  let sent = 0;
  const loops = Array.from({ length: count }, async (_, w) => {
    while (running) {
      const n = sent++;
      const res = await fetch(`${url}/api/trials`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Origin: TEST_ORIGIN, Cookie: cookie },
        body: JSON.stringify({
          title: `Restart ${w}-${n}`,
          crop: 'Bush bean',
          season: '2026',
          design: 'crd',
        }),
      }).catch(() => null);
      const status = res?.status ?? 0;
      statuses.set(status, (statuses.get(status) ?? 0) + 1);
      if (res?.status === 201) acknowledged.push(((await res.json()) as { id: string }).id);
      else await res?.arrayBuffer();
      // A refused write is retried by its sender later; pause as a client would.
      if (status !== 201) await new Promise((r) => setTimeout(r, 20));
    }
  });
  return {
    acknowledged,
    statuses,
    async stop() {
      running = false;
      await Promise.all(loops);
    },
  };
}

const settle = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Waits for a condition (this machine may be busy), failing after a generous bound. */
async function until(what: string, ok: () => boolean, withinMs = 15_000) {
  const deadline = Date.now() + withinMs;
  while (!ok()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting until ${what}`);
    await settle(25);
  }
}

describe('PostgreSQL restarting under concurrent writes', () => {
  it('keeps the app serving and every acknowledged write', async () => {
    expect(await health()).toBe(200);
    const writers = startWriters(16);
    try {
      await until('writes are acknowledged', () => writers.acknowledged.length >= 10);
      for (const mode of ['immediate', 'fast'] as const) {
        stopPg(dataDir, () => {}, mode);
        // While the server is away: the app answers, and says so.
        const away = await fetch(`${url}/api/health`);
        expect(away.status).toBe(503);
        expect(await away.json()).toMatchObject({ database: { reachable: false } });
        await until('writers are refused', () => (writers.statuses.get(503) ?? 0) > 0);
        const before = writers.acknowledged.length;
        await startCluster();
        // Back at once: the first check after the server is ready already succeeds.
        expect(await health()).toBe(200);
        // Writes flow again after the restart.
        await until('writes flow again', () => writers.acknowledged.length >= before + 10);
      }
    } finally {
      await writers.stop();
    }

    // Refusals during the outage are "try again" (503), never a fault of the app or the caller.
    const others = [...writers.statuses].filter(([c]) => c !== 201 && c !== 503);
    expect(others).toEqual([]);

    const stored = await check.selectFrom('trials').select('id').execute();
    const ids = new Set(stored.map((r) => r.id));
    const lost = writers.acknowledged.filter((id) => !ids.has(id));
    expect(writers.acknowledged.length).toBeGreaterThan(20);
    expect(lost).toEqual([]);

    // And the app still serves ordinary requests.
    const list = await fetch(`${url}/api/trials`, { headers: { Cookie: cookie } });
    expect(list.status).toBe(200);
  }, 60_000);
});
