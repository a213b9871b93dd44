/**
 * Benchmark: harvest records written through the app (POST /api/trials/:slug/harvests, signed
 * in, 20 clients at once) against the same rows written bare — one transaction per record
 * holding the INSERT and its audit row — by 20 database clients into the same table. Rounds
 * alternate in one run so the machine's other load hits both alike. Both sides write the same
 * table, so the database's own work on every harvest (its triggers: the trial data version, the
 * plot's harvest totals) is paid on both: the ratio is what the app adds around the write.
 *   npm run bench:writes
 */
import crypto from 'node:crypto';
import autocannon from 'autocannon';
import pg from 'pg';
import {
  buildServer,
  insertBenchTrial,
  signedInLead,
  startBenchDatabase,
  startBenchServer,
  verdict,
} from './support/bench-app';

const TARGET = 0.5;
const CLIENTS = 20;
const ROUND_SECONDS = 4;
const ROUNDS = 3;

const harvestBody = (plotId: string) => ({
  id: crypto.randomUUID(),
  plotId,
  harvestedOn: '2026-07-14',
  fruitCount: 3,
  massG: 412.5,
  grade: 'marketable',
  note: '',
});

/** Records per second the app stored (201s only). */
async function appRound(origin: string, path: string, cookie: string, plotIds: string[]) {
  let n = 0;
  const result = await autocannon({
    url: origin,
    connections: CLIENTS,
    duration: ROUND_SECONDS,
    requests: [
      {
        method: 'POST',
        path,
        headers: { 'content-type': 'application/json', cookie, origin },
        setupRequest: (req) => ({
          ...req,
          body: JSON.stringify(harvestBody(plotIds[n++ % plotIds.length]!)),
        }),
      },
    ],
  });
  const created = result['2xx'];
  if (result.non2xx > 0) throw new Error(`${result.non2xx} POSTs were refused`);
  return created / (result.duration || ROUND_SECONDS);
}

/** Records per second written bare: BEGIN, INSERT … RETURNING, INSERT audit, COMMIT. */
async function bareRound(pool: pg.Pool, trialId: string, actorId: string, plotIds: string[]) {
  const until = performance.now() + ROUND_SECONDS * 1000;
  let n = 0;
  const t0 = performance.now();
  await Promise.all(
    Array.from({ length: CLIENTS }, async () => {
      const client = await pool.connect();
      try {
        while (performance.now() < until) {
          const h = harvestBody(plotIds[n % plotIds.length]!);
          await client.query('begin');
          const { rows } = await client.query(
            `insert into harvests (id, trial_id, plot_id, harvested_on, fruit_count, mass_g, grade, note, created_by, updated_by)
             values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $9) returning *`,
            [
              h.id,
              trialId,
              h.plotId,
              h.harvestedOn,
              h.fruitCount,
              h.massG,
              h.grade,
              h.note,
              actorId,
            ],
          );
          await client.query(
            `insert into audit_log (trial_id, table_name, record_id, action, before, after, actor_id)
             values ($1, 'harvests', $2, 'create', null, $3, $4)`,
            [trialId, h.id, JSON.stringify(rows[0]), actorId],
          );
          await client.query('commit');
          n++;
        }
      } finally {
        client.release();
      }
    }),
  );
  return n / ((performance.now() - t0) / 1000);
}

const database = await startBenchDatabase();
buildServer();
const server = await startBenchServer(database.url);
try {
  const lead = await signedInLead(database.db, server.origin);
  const trial = await insertBenchTrial(database.db, {
    slug: 'bench-writes',
    leadId: lead.userId,
    entries: 20,
    blocks: 4,
    sites: 2,
    harvestsPerPlot: 0,
  });
  const pool = new pg.Pool({ connectionString: database.url, max: CLIENTS });
  const path = `/api/trials/${trial.slug}/harvests`;
  // Warm both sides (JIT, connections, caches) before measuring.
  await appRound(server.origin, path, lead.cookie, trial.plotIds);
  await bareRound(pool, trial.trialId, lead.userId, trial.plotIds);
  const app: number[] = [];
  const bare: number[] = [];
  for (let i = 0; i < ROUNDS; i++) {
    app.push(await appRound(server.origin, path, lead.cookie, trial.plotIds));
    bare.push(await bareRound(pool, trial.trialId, lead.userId, trial.plotIds));
  }
  await pool.end();
  const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  console.log(
    `harvest records per second, ${CLIENTS} clients, ${ROUNDS} alternating rounds of ${ROUND_SECONDS} s`,
  );
  console.log(
    `  app POST:                   ${app.map((r) => r.toFixed(0)).join(' / ')} (mean ${mean(app).toFixed(0)})`,
  );
  console.log(
    `  bare INSERT + audit (1 tx): ${bare.map((r) => r.toFixed(0)).join(' / ')} (mean ${mean(bare).toFixed(0)})`,
  );
  console.log(verdict('writes', mean(app) / mean(bare), TARGET, false));
} finally {
  await server.stop();
  await database.stop();
}
