/**
 * The local cluster: our own PostgreSQL, a local S3 fake (s3rver), a mail capture standing in
 * for the relay, several built app instances (`dist/server/main.js`, production mode) on loopback
 * ports sharing one AUTH_SECRET, one PUBLIC_URL (the balancer's) and the bucket, and nginx in
 * front. Used by `npm run cluster`, the tests through the balancer and the cluster benchmark.
 */
import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { APP_DATABASE, createDatabaseIfMissing } from '../../db/ensure-database';
import { freePort, startPg, stopPg } from '../../db/pg-server';
import { projectRoot } from '../../server/env';
import { type CaptureServer, startCaptureServer } from '../../server/mail/capture-server';
import { type Balancer, startBalancer, type Upstream } from './balancer';
import { FAKE_S3_KEYS, type RunningFakeS3, startFakeS3 } from './fake-s3';

export interface ClusterOptions {
  /** Holds the database, the bucket's files, nginx's files and each instance's log. */
  dir: string;
  /** The PostgreSQL data folder (by default `<dir>/pg`; the `postgres` user must reach it as root). */
  pgDataDir?: string;
  balancerPort: number;
  /** One port per app instance. */
  instancePorts: number[];
  dbPort: number;
  s3Port: number;
  smtpPort: number;
  authSecret: string;
  /** Throwaway database (tests, benchmarks): no fsync. */
  throwaway?: boolean;
  /** How often each instance's /api/ready is asked. */
  healthIntervalMs?: number;
  /** Where the cluster's own lines go (instances' output goes to their log files). */
  log?: (line: string) => void;
  /** Extra environment for every instance (e.g. LOG_LEVEL, rate limits of a benchmark). */
  instanceEnv?: Record<string, string>;
}

export interface AppInstance {
  name: string;
  port: number;
  url: string;
  logFile: string;
  /** The running process, or undefined while stopped. */
  process?: ChildProcess;
}

export interface Cluster {
  url: string;
  databaseUrl: string;
  bucket: { endpoint: string; name: string };
  mailbox: CaptureServer;
  instances: AppInstance[];
  /** Which instance listens on this port (as the balancer's upstream header names it). */
  instanceAt(address: string): AppInstance | undefined;
  /** Sends the signal and waits for the process to end; the instance stays stopped. */
  stopInstance(index: number, signal?: NodeJS.Signals): Promise<void>;
  /** Starts a stopped instance and waits until it is ready. */
  startInstance(index: number): Promise<void>;
  /**
   * A rolling deploy: each instance in turn is taken out of the balancer, stopped with SIGTERM
   * (it finishes what it is answering), started again and put back once ready.
   */
  rollingRestart(): Promise<void>;
  /** The instances nginx's upstream list in use sends requests to. */
  inBalancer(): AppInstance[];
  stop(): Promise<void>;
  /** Stops everything at once, waiting for nothing (the database stops immediately). */
  kill(): void;
}

const BUCKET = 'rowtally-photos';
const READY_TIMEOUT_MS = 120_000;
/** Failed readiness checks in a row before an instance is taken out of the balancer. */
const UNREADY_POLLS = 2;
/** One readiness answer; /api/ready gives each of its own checks 2 s. */
const READY_CHECK_TIMEOUT_MS = 5000;

export async function startCluster(opts: ClusterOptions): Promise<Cluster> {
  const log = opts.log ?? (() => {});
  const dir = path.resolve(opts.dir);
  fs.mkdirSync(dir, { recursive: true });
  const pgDataDir = opts.pgDataDir ?? path.join(dir, 'pg');
  const stack: (() => Promise<void> | void)[] = [];
  const unwind = async () => {
    for (const close of stack.reverse()) await close();
    stack.length = 0;
  };

  try {
    if (process.getuid?.() === 0 && !opts.pgDataDir)
      execFileSync('chown', ['postgres:postgres', dir]);
    const pg = await startPg({
      dataDir: pgDataDir,
      port: opts.dbPort,
      throwaway: opts.throwaway,
      owner: 'npm run cluster',
      log,
    });
    if (pg.started) stack.push(() => void stopPg(pgDataDir, log));
    await createDatabaseIfMissing(pg.url(), APP_DATABASE);
    const databaseUrl = pg.url(APP_DATABASE);

    const s3: RunningFakeS3 = await startFakeS3({
      directory: path.join(dir, 's3'),
      bucket: BUCKET,
      port: opts.s3Port,
    });
    stack.push(() => s3.close());
    log(`S3 fake (s3rver) at ${s3.endpoint}, bucket ${BUCKET}`);

    const mailbox = await startCaptureServer(opts.smtpPort);
    stack.push(() => mailbox.close());

    const url = `http://127.0.0.1:${opts.balancerPort}`;
    const env = {
      PATH: process.env.PATH,
      HOME: process.env.HOME,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PUBLIC_URL: url,
      DATABASE_URL: databaseUrl,
      AUTH_SECRET: opts.authSecret,
      INSTANCE_COUNT: String(opts.instancePorts.length),
      STORAGE_DRIVER: 's3',
      S3_ENDPOINT: s3.endpoint,
      S3_BUCKET: BUCKET,
      S3_ACCESS_KEY_ID: FAKE_S3_KEYS.accessKeyId,
      S3_SECRET_ACCESS_KEY: FAKE_S3_KEYS.secretAccessKey,
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(mailbox.port),
      LOG_LEVEL: 'warn',
      ...opts.instanceEnv,
    };
    const instances: AppInstance[] = opts.instancePorts.map((port, i) => ({
      name: `app${i + 1}`,
      port,
      url: `http://127.0.0.1:${port}`,
      logFile: path.join(dir, `app${i + 1}.log`),
    }));

    const launch = (instance: AppInstance) => {
      const out = fs.openSync(instance.logFile, 'a');
      const child = spawn(
        process.execPath,
        ['--enable-source-maps', path.join(projectRoot, 'dist/server/main.js')],
        {
          cwd: projectRoot,
          env: { ...env, PORT: String(instance.port) },
          stdio: ['ignore', out, out],
        },
      );
      fs.closeSync(out);
      instance.process = child;
      child.once('exit', () => {
        if (instance.process === child) instance.process = undefined;
      });
      return waitReady(instance);
    };
    stack.push(() =>
      Promise.all(instances.map((instance) => stopProcess(instance.process, 'SIGTERM'))).then(
        () => {},
      ),
    );
    // Started together on purpose: the migrations run once, under PostgreSQL's advisory lock.
    await Promise.all(instances.map(launch));
    log(`${instances.length} app instances ready on ports ${opts.instancePorts.join(', ')}`);

    // Instances held out of the balancer (being restarted), and whether each is ready. A poll
    // only changes `ready` for an instance nothing else touched while the poll was out (a stop or
    // start in between makes its answer stale), and takes an instance out only after
    // UNREADY_POLLS answers in a row, so one slow answer on a busy machine is not an outage.
    const held = new Set<number>();
    const ready = instances.map(() => true);
    const generation = instances.map(() => 0);
    const missed = instances.map(() => 0);
    const upstreams = (): Upstream[] =>
      instances.map((instance, i) => ({ port: instance.port, down: held.has(i) || !ready[i] }));
    const balancer: Balancer = await startBalancer({
      dir: path.join(dir, 'nginx'),
      port: opts.balancerPort,
      upstreams: upstreams(),
    });
    stack.push(() => balancer.stop());
    log(`nginx balancing ${url} over ${instances.length} instances`);
    const setReady = async (index: number, value: boolean) => {
      generation[index]!++;
      missed[index] = 0;
      ready[index] = value;
      await balancer.setUpstreams(upstreams());
    };

    let polling = false;
    let closed = false;
    const poll = async () => {
      if (polling || closed) return;
      polling = true;
      try {
        const asked = [...generation];
        const now = await Promise.all(instances.map((instance) => isReady(instance.url)));
        if (closed) return;
        let changed = false;
        now.forEach((answered, i) => {
          if (generation[i] !== asked[i]) return;
          missed[i] = answered ? 0 : missed[i]! + 1;
          const value = answered ? true : missed[i]! >= UNREADY_POLLS ? false : ready[i]!;
          if (value === ready[i]) return;
          log(`${instances[i]!.name} is ${value ? 'ready' : 'not ready'}`);
          ready[i] = value;
          changed = true;
        });
        if (changed) await balancer.setUpstreams(upstreams());
      } finally {
        polling = false;
      }
    };
    const watcher = setInterval(
      () => void poll().catch((err: unknown) => log(`health check: ${String(err)}`)),
      opts.healthIntervalMs ?? 1000,
    );
    stack.push(() => {
      closed = true;
      clearInterval(watcher);
    });

    const stopInstance = async (index: number, signal: NodeJS.Signals = 'SIGTERM') => {
      generation[index]!++;
      await stopProcess(instances[index]!.process, signal);
      await setReady(index, false);
    };
    const startInstance = async (index: number) => {
      generation[index]!++;
      await launch(instances[index]!);
      await setReady(index, true);
    };

    return {
      url,
      databaseUrl,
      bucket: { endpoint: s3.endpoint, name: BUCKET },
      mailbox,
      instances,
      instanceAt: (address) => instances.find((i) => address.endsWith(`:${i.port}`)),
      stopInstance,
      startInstance,
      async rollingRestart() {
        for (const [index, instance] of instances.entries()) {
          log(`rolling restart: ${instance.name}`);
          held.add(index);
          await balancer.setUpstreams(upstreams());
          await stopInstance(index, 'SIGTERM');
          log(`rolling restart: ${instance.name} stopped`);
          await startInstance(index);
          held.delete(index);
          await balancer.setUpstreams(upstreams());
          log(`rolling restart: ${instance.name} ready and back in the balancer`);
        }
      },
      inBalancer: () => balancer.inService().map((u) => instances.find((i) => i.port === u.port)!),
      stop: unwind,
      kill() {
        for (const instance of instances) instance.process?.kill('SIGKILL');
        balancer.kill();
        if (pg.started) stopPg(pgDataDir, log, 'immediate');
      },
    };
  } catch (err) {
    await unwind();
    throw err;
  }
}

/**
 * A throwaway cluster for the tests and the benchmark: a temporary folder, free loopback ports
 * and a fresh secret; stopping it also removes the folder.
 */
export async function startThrowawayCluster(
  instances: number,
  opts: Pick<ClusterOptions, 'healthIntervalMs' | 'instanceEnv' | 'log'> = {},
): Promise<Cluster> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-cluster-'));
  const cluster = await startCluster({
    dir,
    balancerPort: await freePort(),
    instancePorts: await Promise.all(Array.from({ length: instances }, () => freePort())),
    dbPort: await freePort(),
    s3Port: await freePort(),
    smtpPort: await freePort(),
    authSecret: crypto.randomBytes(32).toString('hex'),
    throwaway: true,
    ...opts,
  });
  return {
    ...cluster,
    async stop() {
      await cluster.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

async function isReady(url: string): Promise<boolean> {
  try {
    const res = await fetch(`${url}/api/ready`, {
      signal: AbortSignal.timeout(READY_CHECK_TIMEOUT_MS),
    });
    await res.arrayBuffer();
    return res.ok;
  } catch {
    return false;
  }
}

async function waitReady(instance: AppInstance): Promise<void> {
  const deadline = Date.now() + READY_TIMEOUT_MS;
  while (!(await isReady(instance.url))) {
    if (!instance.process || Date.now() > deadline) {
      const tail = fs.readFileSync(instance.logFile, 'utf8').split('\n').slice(-12).join('\n');
      throw new Error(`${instance.name} did not become ready:\n${tail}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** Signals the process and waits until it has ended (SIGKILL after 30 s). */
async function stopProcess(child: ChildProcess | undefined, signal: NodeJS.Signals) {
  if (!child || child.exitCode !== null || child.signalCode !== null) return;
  const ended = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  child.kill(signal);
  const timer = setTimeout(() => child.kill('SIGKILL'), 30_000);
  await ended;
  clearTimeout(timer);
}
