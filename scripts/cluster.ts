/**
 * npm run cluster: several built app instances behind Debian's nginx on one address, with our
 * own PostgreSQL, a local S3 fake and a mail capture — the layout of a several-server host on
 * this one machine (scripts/cluster/cluster.ts). Ctrl+C or SIGTERM stops everything; SIGHUP
 * restarts the instances one at a time, as a rolling deploy does.
 */
import { spawnSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { createDb, createPool } from '../db/database';
import { defaultDataDir } from '../db/pg-server';
import { seedDemoIfEmpty } from '../db/seed/seed';
import { projectRoot } from '../server/env';
import { s3Storage } from '../server/storage/s3-storage';
import { type Cluster, startCluster } from './cluster/cluster';
import { FAKE_S3_KEYS } from './cluster/fake-s3';
import { buildWithProgress } from './build-progress';
import { printDemoSignIns } from './demo-sign-ins';
import { ensureSystemPackages } from './system-packages';

const port = z.coerce.number().int().min(1).max(65535);
const settings = z
  .object({
    /** The balancer's port: the one address people use. The instances take the next ports. */
    CLUSTER_PORT: port.default(8080),
    CLUSTER_INSTANCES: z.coerce.number().int().min(1).max(9).default(3),
    /** The first instance's port (the others follow); by default the one after CLUSTER_PORT. */
    CLUSTER_APP_PORT: port.optional(),
    CLUSTER_DB_PORT: port.default(55433),
    CLUSTER_S3_PORT: port.default(4569),
    CLUSTER_SMTP_PORT: port.default(2526),
  })
  .parse(process.env);

const dataDir = path.join(projectRoot, '.data', 'cluster');
// Beside npm start's database, so the `postgres` user can reach it as that one can.
const pgDataDir = path.join(path.dirname(defaultDataDir(projectRoot)), 'cluster-pg');

/** One secret for every instance, kept so sessions survive a restart of the cluster. */
function sharedSecret(): string {
  const file = path.join(dataDir, 'auth-secret');
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataDir, { recursive: true });
    fs.writeFileSync(file, crypto.randomBytes(32).toString('hex'), { mode: 0o600 });
  }
  return fs.readFileSync(file, 'utf8').trim();
}

let cluster: Cluster | undefined;
let stoppingSince: number | undefined;
/** A signal this soon after the first is the same one delivered again. */
const SAME_SIGNAL_MS = 3000;
async function stop(code: number) {
  if (stoppingSince !== undefined) {
    // One Ctrl+C (or a signal to the process group) reaches this process twice: from the
    // terminal and relayed by tsx. Only a later one cuts the orderly stop short.
    if (Date.now() - stoppingSince < SAME_SIGNAL_MS) return;
    cluster?.kill();
    process.exit(code);
  }
  stoppingSince = Date.now();
  console.log('\nStopping the cluster…');
  await cluster?.stop();
  process.exit(code);
}

async function main() {
  process.on('SIGINT', () => void stop(130));
  process.on('SIGTERM', () => void stop(143));
  ensureSystemPackages(['postgresql', 'nginx']);
  if (!process.argv.includes('--no-build')) {
    await buildWithProgress({
      what: 'the client',
      command: process.execPath,
      args: ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'],
    });
    const server = spawnSync('npm', ['run', '--silent', 'build:server'], { stdio: 'inherit' });
    if (server.status !== 0) throw new Error('The server build failed.');
  }
  if (stoppingSince !== undefined) return;

  const ports = Array.from(
    { length: settings.CLUSTER_INSTANCES },
    (_, i) => (settings.CLUSTER_APP_PORT ?? settings.CLUSTER_PORT + 1) + i,
  );
  cluster = await startCluster({
    dir: dataDir,
    pgDataDir,
    balancerPort: settings.CLUSTER_PORT,
    instancePorts: ports,
    dbPort: settings.CLUSTER_DB_PORT,
    s3Port: settings.CLUSTER_S3_PORT,
    smtpPort: settings.CLUSTER_SMTP_PORT,
    authSecret: sharedSecret(),
    log: (line) => console.log(line),
  });
  if (stoppingSince !== undefined) return;

  const db = createDb(createPool(cluster.databaseUrl, 2));
  try {
    const storage = s3Storage({
      endpoint: cluster.bucket.endpoint,
      bucket: cluster.bucket.name,
      region: 'us-east-1',
      ...FAKE_S3_KEYS,
    });
    if (await seedDemoIfEmpty(db, storage))
      console.log('Loaded the demo season (Larkhaven Seed Library).');
  } finally {
    await db.destroy();
  }

  // The capture stands in for the mail relay: each message's links are printed here.
  let shown = 0;
  setInterval(() => {
    for (const mail of cluster!.mailbox.messages().slice(shown)) {
      console.log(`Mail to ${mail.to.join(', ')}: ${mail.subject}`);
      for (const link of mail.links) console.log(`  ${link}`);
    }
    shown = cluster!.mailbox.messages().length;
  }, 1000).unref();

  process.on('SIGHUP', () => {
    console.log('Restarting every instance in turn…');
    cluster!
      .rollingRestart()
      .then(() => console.log('Rolling restart done.'))
      .catch((err: unknown) => console.error(err instanceof Error ? err.message : err));
  });

  console.log(`\nRowtally (${ports.length} instances behind nginx) is running at ${cluster.url}\n`);
  console.log(`Instances: ${cluster.instances.map((i) => `${i.name} ${i.url}`).join(', ')}`);
  console.log(`Logs: ${dataDir}/app*.log, ${dataDir}/nginx/access.log`);
  console.log('Mail is not delivered: each message and its links are printed here.\n');
  printDemoSignIns();
  console.log(`\nRolling restart: kill -HUP ${process.pid}. Press Ctrl+C to stop.`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  void stop(1);
});
