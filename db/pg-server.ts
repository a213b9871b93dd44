/**
 * Our own PostgreSQL: Debian's server binaries, a data folder of our own, listening on
 * 127.0.0.1 only. Used by `npm start`, `npm test` and the db:* scripts.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';

export const DB_SUPERUSER = 'app';

export class PgServerError extends Error {
  override name = 'PgServerError';
}

const isRoot = () => typeof process.getuid === 'function' && process.getuid() === 0;

/** Highest installed major version's bin folder, or null. */
export function findPgBinDir(): string | null {
  const base = '/usr/lib/postgresql';
  if (!fs.existsSync(base)) return null;
  const versions = fs
    .readdirSync(base)
    .filter((v) => fs.existsSync(path.join(base, v, 'bin', 'pg_ctl')))
    .sort((a, b) => Number(b) - Number(a));
  return versions[0] ? path.join(base, versions[0], 'bin') : null;
}

/** Finds the binaries, installing Debian's `postgresql` package when we may. */
export function ensurePgInstalled(log: (msg: string) => void = console.log): string {
  const found = findPgBinDir();
  if (found) return found;
  const command = 'apt-get update && apt-get install -y postgresql';
  if (!isRoot()) {
    throw new PgServerError(
      `PostgreSQL server binaries not found in /usr/lib/postgresql/*/bin. Install them with:\n  sudo sh -c '${command}'`,
    );
  }
  log('PostgreSQL is not installed; installing the Debian package (apt-get install postgresql)…');
  const result = spawnSync('sh', ['-c', command], {
    stdio: ['ignore', 'inherit', 'inherit'],
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  const bin = findPgBinDir();
  if (result.status !== 0 || !bin) {
    throw new PgServerError(
      `Installing PostgreSQL failed (exit ${result.status}). Run: ${command}`,
    );
  }
  return bin;
}

/** The server refuses to run as root; as root we run it as the `postgres` system user. */
function asServerUser(bin: string, args: string[], opts: { allowFail?: boolean } = {}) {
  const [cmd, argv] = isRoot() ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
  const result = spawnSync(cmd, argv, { encoding: 'utf8' });
  if (result.status !== 0 && !opts.allowFail) {
    throw new PgServerError(
      `${path.basename(bin)} failed (exit ${result.status}): ${(result.stderr || result.stdout).trim()}`,
    );
  }
  return result;
}

/** Can the `postgres` user reach (traverse into) this folder? Needed when we are root. */
function serverUserCanReach(dir: string): boolean {
  if (!isRoot()) return true;
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dir]).status === 0;
}

export function isPortFree(port: number, host = '127.0.0.1'): Promise<boolean> {
  return new Promise((resolve) => {
    const srv = net.createServer();
    srv.once('error', () => resolve(false));
    srv.listen(port, host, () => srv.close(() => resolve(true)));
  });
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

export interface PgServerOptions {
  dataDir: string;
  port: number;
  /** Throwaway clusters (tests) skip fsync; a real season's records never do. */
  throwaway?: boolean;
  log?: (msg: string) => void;
  /**
   * Who starts the server and stops it again when they end (`npm start`). A server this owner
   * started and left running (the process was killed) counts as started here on the next start.
   * Without an owner (`npm run db:start`) the server is left running on purpose.
   */
  owner?: string;
}

export interface RunningPg {
  url: (database?: string) => string;
  port: number;
  dataDir: string;
  /**
   * True when this call started the server, or when `owner` had started this very server
   * earlier and did not stop it (false: someone else's server, already running).
   */
  started: boolean;
  /** Started by `owner` on an earlier run and found still running. */
  reclaimed?: boolean;
}

/** Beside the data folder, not in it: PostgreSQL owns the folder and its contents. */
const ownerFile = (dataDir: string) => `${dataDir}.started-by.json`;

/** The running postmaster's process id, from the first line of its pid file. */
function postmasterPid(dataDir: string): number | null {
  const pidFile = path.join(dataDir, 'postmaster.pid');
  if (!fs.existsSync(pidFile)) return null;
  const pid = Number(fs.readFileSync(pidFile, 'utf8').split('\n')[0]);
  return Number.isInteger(pid) && pid > 0 ? pid : null;
}

function writeOwner(dataDir: string, owner: string | undefined) {
  const file = ownerFile(dataDir);
  const pid = postmasterPid(dataDir);
  if (!owner || pid === null) {
    fs.rmSync(file, { force: true });
    return;
  }
  fs.writeFileSync(file, JSON.stringify({ owner, postmasterPid: pid }));
}

/** Did `owner` start the server running in `dataDir` now (same postmaster, not a later one)? */
function startedBy(dataDir: string, owner: string | undefined): boolean {
  if (!owner) return false;
  try {
    const mark = JSON.parse(fs.readFileSync(ownerFile(dataDir), 'utf8')) as {
      owner?: unknown;
      postmasterPid?: unknown;
    };
    return mark.owner === owner && mark.postmasterPid === postmasterPid(dataDir);
  } catch {
    return false;
  }
}

function isRunning(bin: string, dataDir: string): boolean {
  if (!fs.existsSync(path.join(dataDir, 'PG_VERSION'))) return false;
  return (
    asServerUser(path.join(bin, 'pg_ctl'), ['-D', dataDir, 'status'], { allowFail: true })
      .status === 0
  );
}

function runningPort(dataDir: string): number | null {
  const pidFile = path.join(dataDir, 'postmaster.pid');
  if (!fs.existsSync(pidFile)) return null;
  const lines = fs.readFileSync(pidFile, 'utf8').split('\n');
  const port = Number(lines[3]);
  return Number.isFinite(port) ? port : null;
}

/** Creates the cluster when needed and starts it; reuses one already running. Idempotent. */
export async function startPg(opts: PgServerOptions): Promise<RunningPg> {
  const log = opts.log ?? console.log;
  const bin = ensurePgInstalled(log);
  const dataDir = path.resolve(opts.dataDir);
  const url =
    (port: number) =>
    (database = 'postgres') =>
      `postgres://${DB_SUPERUSER}@127.0.0.1:${port}/${database}`;

  if (isRunning(bin, dataDir)) {
    const port = runningPort(dataDir) ?? opts.port;
    const ours = startedBy(dataDir, opts.owner);
    if (ours) {
      log(
        `PostgreSQL in ${dataDir} is still running from an earlier ${opts.owner} that did not stop it; reusing it and stopping it on exit.`,
      );
    } else if (port !== opts.port) {
      log(
        `PostgreSQL in ${dataDir} is already running on port ${port} (asked for ${opts.port}); reusing it.`,
      );
    }
    return { url: url(port), port, dataDir, started: ours, reclaimed: ours };
  }

  const parent = path.dirname(dataDir);
  fs.mkdirSync(parent, { recursive: true });
  if (!serverUserCanReach(parent)) {
    throw new PgServerError(
      `The postgres system user cannot reach ${parent}; PostgreSQL refuses to run as root, so its data folder must be reachable by that user. Set ROWTALLY_DATA_DIR to a folder it can reach.`,
    );
  }
  if (!fs.existsSync(path.join(dataDir, 'PG_VERSION'))) {
    fs.mkdirSync(dataDir, { recursive: true, mode: 0o700 });
    if (isRoot()) execFileSync('chown', ['postgres:postgres', dataDir]);
    log(`Creating a PostgreSQL cluster in ${dataDir}…`);
    asServerUser(path.join(bin, 'initdb'), [
      '-D',
      dataDir,
      '-A',
      'trust',
      '-U',
      DB_SUPERUSER,
      '-E',
      'UTF8',
      '--locale=C.UTF-8',
    ]);
  }
  if (!(await isPortFree(opts.port))) {
    throw new PgServerError(
      `Port ${opts.port} on 127.0.0.1 is already taken by another program; set ROWTALLY_DB_PORT to a free port.`,
    );
  }
  const durability = opts.throwaway
    ? ' -c fsync=off -c full_page_writes=off -c synchronous_commit=off'
    : '';
  const serverOpts = `-p ${opts.port} -k ${dataDir} -c listen_addresses=127.0.0.1${durability}`;
  const started = asServerUser(
    path.join(bin, 'pg_ctl'),
    [
      '-D',
      dataDir,
      '-o',
      serverOpts,
      '-l',
      path.join(dataDir, 'server.log'),
      '-w',
      '-t',
      '60',
      'start',
    ],
    { allowFail: true },
  );
  if (started.status !== 0) {
    const tail = fs.existsSync(path.join(dataDir, 'server.log'))
      ? fs.readFileSync(path.join(dataDir, 'server.log'), 'utf8').split('\n').slice(-8).join('\n')
      : '';
    throw new PgServerError(`PostgreSQL did not start: ${started.stderr.trim()}\n${tail}`);
  }
  writeOwner(dataDir, opts.owner);
  return { url: url(opts.port), port: opts.port, dataDir, started: true };
}

/**
 * `fast` ends every session with "terminating connection due to administrator command";
 * `immediate` stops without a clean shutdown, as a crash would (recovery runs on the next start).
 */
export function stopPg(
  dataDir: string,
  log: (msg: string) => void = console.log,
  mode: 'fast' | 'immediate' = 'fast',
): boolean {
  const bin = findPgBinDir();
  const dir = path.resolve(dataDir);
  if (!bin || !isRunning(bin, dir)) {
    log(`PostgreSQL in ${dir} is not running.`);
    return false;
  }
  asServerUser(path.join(bin, 'pg_ctl'), ['-D', dir, '-m', mode, '-w', 'stop']);
  fs.rmSync(ownerFile(dir), { force: true });
  log(`PostgreSQL in ${dir} stopped.`);
  return true;
}

/**
 * The data folder: ROWTALLY_DATA_DIR, else `.data/pg` in the project. As root the server runs
 * as `postgres`, which cannot enter a project cloned into a private folder (mktemp -d is 0700);
 * then the cluster lives in /var/tmp under a name derived from the project path.
 */
export function defaultDataDir(projectRoot: string): string {
  const inProject = path.join(projectRoot, '.data', 'pg');
  if (serverUserCanReach(projectRoot)) return inProject;
  const tag = createHash('sha1').update(projectRoot).digest('hex').slice(0, 10);
  return path.join('/var/tmp', `rowtally-${tag}`, 'pg');
}
