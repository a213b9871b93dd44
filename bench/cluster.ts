/**
 * Benchmark: the local cluster (built instances behind nginx, scripts/cluster) with 3, 2 and 1
 * instances answering, then 1, 2 and 3 again (so the machine's other load hits each alike):
 * analysis and harvest-write throughput through the balancer as ratios to one instance, and the
 * p95 of the trial page (GET /api/trials/:slug, signed in) under 50 concurrent readers.
 *   npm run bench:cluster
 * Targets (our own expectation, common practice, no source): on this 2-core machine the
 * instances, nginx, PostgreSQL and the load generator share the same two cores, so a second
 * instance can add at most about one core's worth and a third none. What must hold here is
 * that adding instances loses nothing: throughput with 2 and with 3 instances at least that
 * of one (ratio ≥ 1), and the trial page's p95 with 3 instances no worse than with one
 * (ratio ≤ 1). On a host with a core per instance the same ratios show the scaling itself.
 */
import crypto from 'node:crypto';
import os from 'node:os';
import autocannon from 'autocannon';
import { createDb, createPool } from '../db/database';
import { startThrowawayCluster } from '../scripts/cluster/cluster';
import {
  buildServer,
  closingVerdict,
  insertBenchTrial,
  percentile,
  signedInLead,
  verdict,
} from './support/bench-app';

const INSTANCES = 3;
const ROUND_SECONDS = 5;
const CLIENTS = 20;
const READERS = 50;

buildServer();
const cluster = await startThrowawayCluster(INSTANCES, {
  instanceEnv: { ANALYSIS_RATE_PER_MINUTE: '100000', MAIL_DRIVER: 'off' },
});
const db = createDb(createPool(cluster.databaseUrl, 4));

let failures = 0;
let lostInAll = 0;
/**
 * Requests per second answered 2xx. Anything else is counted and printed, not fatal: a
 * connection nginx closes while it reloads its list of instances is retried by real clients.
 */
async function throughput(opts: autocannon.Options): Promise<number> {
  const result = await autocannon({ connections: CLIENTS, duration: ROUND_SECONDS, ...opts });
  failures += result.non2xx + result.errors;
  return result['2xx'] / (result.duration || ROUND_SECONDS);
}

/** 50 readers, each asking again as soon as answered; latencies of every answer in ms. */
async function readerLatencies(url: string, cookie: string): Promise<number[]> {
  const until = performance.now() + ROUND_SECONDS * 1000;
  const latencies: number[] = [];
  await Promise.all(
    Array.from({ length: READERS }, async () => {
      while (performance.now() < until) {
        const t0 = performance.now();
        const res = await fetch(url, { headers: { cookie } });
        await res.arrayBuffer();
        if (!res.ok) throw new Error(`the trial page answered ${res.status}`);
        latencies.push(performance.now() - t0);
      }
    }),
  );
  return latencies.sort((a, b) => a - b);
}

try {
  const lead = await signedInLead(db, cluster.url);
  const trial = await insertBenchTrial(db, {
    slug: 'bench-cluster',
    leadId: lead.userId,
    entries: 12,
    blocks: 4,
    sites: 2,
    harvestsPerPlot: 3,
  });
  const headers = { cookie: lead.cookie, origin: cluster.url };
  let n = 0;
  const measure = async () => ({
    analysis: await throughput({
      url: `${cluster.url}/api/trials/${trial.slug}/analysis?trait=yield&alpha=0.05&letters=hsd`,
      headers,
    }),
    writes: await throughput({
      url: cluster.url,
      requests: [
        {
          method: 'POST',
          path: `/api/trials/${trial.slug}/harvests`,
          headers: { ...headers, 'content-type': 'application/json' },
          setupRequest: (req) => ({
            ...req,
            body: JSON.stringify({
              id: crypto.randomUUID(),
              plotId: trial.plotIds[n++ % trial.plotIds.length],
              harvestedOn: '2026-07-14',
              fruitCount: 3,
              massG: 412.5,
              grade: 'marketable',
            }),
          }),
        },
      ],
    }),
    p95: percentile(
      await readerLatencies(`${cluster.url}/api/trials/${trial.slug}`, lead.cookie),
      0.95,
    ),
  });

  // Warm every instance (JIT, connections) before measuring.
  await measure();
  const runs = new Map<number, { analysis: number; writes: number; p95: number }[]>();
  let last = INSTANCES;
  const record = async (count: number) => {
    // After a change in the number of instances, one round lets nginx and the newcomers settle.
    if (count !== last) await measure();
    last = count;
    failures = 0;
    const m = await measure();
    lostInAll += failures;
    runs.set(count, [...(runs.get(count) ?? []), m]);
    console.log(
      `  ${count} instance(s): analysis ${m.analysis.toFixed(0)}/s, writes ${m.writes.toFixed(0)}/s, trial page p95 ${m.p95.toFixed(0)} ms` +
        (failures ? `, ${failures} answers not 2xx or lost` : ''),
    );
  };
  console.log(
    `through nginx, ${CLIENTS} clients for throughput, ${READERS} readers for the trial page, rounds of ${ROUND_SECONDS} s`,
  );
  await record(3);
  await cluster.stopInstance(2);
  await record(2);
  await cluster.stopInstance(1);
  await record(1);
  await record(1);
  await cluster.startInstance(1);
  await record(2);
  await cluster.startInstance(2);
  await record(3);

  const mean = (count: number, key: 'analysis' | 'writes' | 'p95') => {
    const xs = runs.get(count)!.map((r) => r[key]);
    return xs.reduce((a, b) => a + b, 0) / xs.length;
  };
  console.log(`cores on this machine: ${os.cpus().length}`);
  for (const count of [1, 2, 3]) {
    console.log(
      `${count} instance(s): analysis ${mean(count, 'analysis').toFixed(0)}/s, ` +
        `harvest writes ${mean(count, 'writes').toFixed(0)}/s, ` +
        `trial page p95 ${mean(count, 'p95').toFixed(0)} ms under ${READERS} readers`,
    );
  }
  console.log(`answers not 2xx or lost while measuring: ${lostInAll} (expected 0)`);
  const ratio = (count: number, key: 'analysis' | 'writes' | 'p95') =>
    mean(count, key) / mean(1, key);
  const lines = [
    verdict('cluster analysis, 2 ÷ 1 instances', ratio(2, 'analysis'), 1, false),
    verdict('cluster analysis, 3 ÷ 1 instances', ratio(3, 'analysis'), 1, false),
    verdict('cluster harvest writes, 2 ÷ 1 instances', ratio(2, 'writes'), 1, false),
    verdict('cluster harvest writes, 3 ÷ 1 instances', ratio(3, 'writes'), 1, false),
    verdict('cluster trial page p95, 3 ÷ 1 instances', ratio(3, 'p95'), 1, true),
  ];
  for (const line of lines) console.log(line);
  console.log(closingVerdict('cluster', lines, lostInAll === 0));
} finally {
  await db.destroy();
  await cluster.stop();
}
