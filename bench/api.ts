/**
 * Benchmark: read routes through the built server, 20 connections each, p95 latency divided by
 * /api/health's p95 measured in the same run (health asks the database `select 1`, so the
 * ratio is what the route costs beyond one round trip). Routes and health alternate in rounds
 * so the machine's other load hits them alike. Also: the trial analysis of a trial with ten
 * times the harvest rows (240,000 against 24,000, same plots) divided by the smaller one's.
 *   npm run bench:api
 */
import autocannon from 'autocannon';
import { sql } from 'kysely';
import {
  buildServer,
  insertBenchTrial,
  median,
  percentile,
  signedInLead,
  startBenchDatabase,
  startBenchServer,
  verdict,
} from './support/bench-app';

const CONNECTIONS = 20;
const ROUND_SECONDS = 3;
const ROUNDS = 2;
// 50 entries × 4 blocks × 3 gardens = 600 plots; 40 or 400 pickings per plot.
const DESIGN = { entries: 50, blocks: 4, sites: 3 };

/** Latencies (ms) of every answered request in one timed run. */
async function latencies(origin: string, path: string, cookie: string): Promise<number[]> {
  const times: number[] = [];
  await new Promise<void>((resolve, reject) => {
    const instance = autocannon(
      {
        url: origin + path,
        connections: CONNECTIONS,
        duration: ROUND_SECONDS,
        headers: { cookie },
      },
      (err) => (err ? reject(err) : resolve()),
    );
    instance.on('response', (_client, status, _bytes, ms) => {
      if (status >= 400) reject(new Error(`${path} answered ${status}`));
      times.push(ms);
    });
  });
  return times;
}

const database = await startBenchDatabase();
buildServer();
const server = await startBenchServer(database.url);
try {
  const lead = await signedInLead(database.db, server.origin);
  const small = await insertBenchTrial(database.db, {
    slug: 'bench-small',
    leadId: lead.userId,
    ...DESIGN,
    harvestsPerPlot: 40,
  });
  await insertBenchTrial(database.db, {
    slug: 'bench-large',
    leadId: lead.userId,
    ...DESIGN,
    harvestsPerPlot: 400,
  });
  // Publish the small trial's sheet through the app, as a lead does.
  const headers = {
    'content-type': 'application/json',
    cookie: lead.cookie,
    origin: server.origin,
  };
  const saved = await fetch(`${server.origin}/api/trials/${small.slug}/results-sheet`, {
    method: 'PUT',
    headers,
    body: JSON.stringify({
      summary: 'Invented figures for a speed check.',
      methods: null,
      traits: [{ key: 'yield', basis: 'plot', weight: 1 }],
      entryNotes: {},
      coverPhotos: {},
      alpha: 0.05,
      letters: 'hsd',
      license: 'CC-BY-4.0',
    }),
  });
  if (!saved.ok) throw new Error(`saving the sheet: ${saved.status} ${await saved.text()}`);
  const published = await fetch(`${server.origin}/api/trials/${small.slug}/results-sheet/publish`, {
    method: 'POST',
    headers,
    body: JSON.stringify({ changeNote: '' }),
  });
  if (!published.ok) throw new Error(`publishing: ${published.status} ${await published.text()}`);

  const routes = {
    health: '/api/health',
    analysis: `/api/trials/${small.slug}/analysis?trait=yield`,
    comparison: `/api/trials/${small.slug}/comparison/entry-site?trait=yield`,
    public: `/api/results/${small.slug}`,
    analysis240k: `/api/trials/bench-large/analysis?trait=yield`,
  } as const;
  type Route = keyof typeof routes;
  const samples = Object.fromEntries(Object.keys(routes).map((k) => [k, [] as number[]])) as Record<
    Route,
    number[]
  >;
  // Warm-up: JIT, connections, the worker pool.
  for (const path of Object.values(routes)) await latencies(server.origin, path, lead.cookie);
  for (let i = 0; i < ROUNDS; i++)
    for (const [name, path] of Object.entries(routes) as [Route, string][])
      samples[name].push(...(await latencies(server.origin, path, lead.cookie)));
  const p95 = Object.fromEntries(
    Object.entries(samples).map(([k, v]) => [
      k,
      percentile(
        [...v].sort((a, b) => a - b),
        0.95,
      ),
    ]),
  ) as Record<Route, number>;
  console.log(
    `p95 latency, ${CONNECTIONS} connections, ${ROUNDS} rounds of ${ROUND_SECONDS} s per route`,
  );
  for (const k of Object.keys(routes) as Route[])
    console.log(
      `  ${k.padEnd(13)} ${p95[k].toFixed(1).padStart(8)} ms  (${samples[k].length} requests)`,
    );
  // The same analysis uncached: the data version moved on before each request, so the plots'
  // harvest totals are read and the engine runs every time (median of 5, alternating trials).
  const cold: Record<'small' | 'large', number[]> = { small: [], large: [] };
  for (let i = 0; i < 5; i++)
    for (const [name, slug] of [
      ['small', small.slug],
      ['large', 'bench-large'],
    ] as const) {
      await sql`update trials set data_version = data_version + 1 where slug = ${slug}`.execute(
        database.db,
      );
      const t0 = performance.now();
      const res = await fetch(`${server.origin}/api/trials/${slug}/analysis?trait=yield`, {
        headers: { cookie: lead.cookie },
      });
      await res.arrayBuffer();
      cold[name].push(performance.now() - t0);
    }
  console.log(
    `  uncached analysis: 24k ${median(cold.small).toFixed(0)} ms, 240k ${median(cold.large).toFixed(0)} ms (median of 5)`,
  );
  const lines = [
    verdict(
      'api uncached analysis 240k ÷ 24k harvests',
      median(cold.large) / median(cold.small),
      1.5,
      true,
    ),
    verdict('api analysis ÷ health', p95.analysis / p95.health, 5, true),
    verdict('api comparison ÷ health', p95.comparison / p95.health, 5, true),
    verdict('api public results ÷ health', p95.public / p95.health, 2, true),
    verdict('api analysis 240k ÷ 24k harvests', p95.analysis240k / p95.analysis, 1.5, true),
  ];
  for (const line of lines) console.log(line);
  // "… NOT met" also ends in " met": count the lines whose verdict follows the target directly.
  const met = lines.filter((l) => l.endsWith(') met')).length;
  console.log(
    `api: ratio ${met}/${lines.length} targets (target ${lines.length}/${lines.length}) ${met === lines.length ? 'met' : 'NOT met'}`,
  );
} finally {
  await server.stop();
  await database.stop();
}
