/**
 * `npm start` stops the PostgreSQL server it started: on Ctrl+C (SIGINT to the terminal's whole
 * process group) and on SIGTERM to the command alone. When the command was killed outright and
 * left its server running, the next start recognises that server as its own and stops it in
 * turn; a server someone started with `npm run db:start` is left running. At the default log
 * level a request prints no line. The command runs through npm, on a cluster of this file's own
 * in a temporary folder, without the client build.
 */
import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findPgBinDir, freePort, startPg, stopPg } from '../../db/pg-server';

let base: string;
let dataDir: string;
let env: NodeJS.ProcessEnv;
let webPort: number;
const started: ChildProcess[] = [];

beforeAll(async () => {
  base = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-start-'));
  if (process.getuid?.() === 0) execFileSync('chown', ['postgres:postgres', base]);
  dataDir = path.join(base, 'pg');
  webPort = await freePort();
  env = {
    PATH: process.env.PATH,
    HOME: process.env.HOME,
    NODE_ENV: 'development',
    LOG_LEVEL: 'info',
    HOST: '127.0.0.1',
    PORT: String(webPort),
    ROWTALLY_DB_PORT: String(await freePort()),
    ROWTALLY_DATA_DIR: dataDir,
    SMTP_PORT: String(await freePort()),
    UPLOADS_DIR: path.join(base, 'uploads'),
  };
});

afterAll(() => {
  for (const child of started)
    if (child.exitCode === null && child.signalCode === null) kill(child, 'SIGKILL');
  if (dataDir) stopPg(dataDir, () => {}, 'immediate');
  if (base) fs.rmSync(base, { recursive: true, force: true });
});

function kill(child: ChildProcess, signal: NodeJS.Signals) {
  // The command runs in a process group of its own, as in a terminal; a negative pid is the group.
  process.kill(-child.pid!, signal);
}

/**
 * Starts `npm start -- --no-build` (the built dist/server/start.js), or without npm the same
 * script from source (`node --import tsx scripts/start.ts`); resolves once it says it is running.
 */
async function start(via: 'npm' | 'node' = 'npm') {
  const [cmd, args] =
    via === 'npm'
      ? ['npm', ['start', '--silent', '--', '--no-build']]
      : [process.execPath, ['--import', 'tsx', 'scripts/start.ts', '--no-build']];
  const child = spawn(cmd, args, {
    env,
    detached: true,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  started.push(child);
  let output = '';
  child.stdout!.on('data', (d: Buffer) => (output += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (output += d.toString()));
  // 'close' comes after the last output has been read, unlike 'exit'.
  const exited = new Promise<number | null>((resolve) =>
    child.once('close', (code) => resolve(code)),
  );
  await new Promise<void>((resolve, reject) => {
    const timer = setInterval(() => {
      if (output.includes('Press Ctrl+C to stop.')) {
        clearInterval(timer);
        resolve();
      } else if (child.exitCode !== null) {
        clearInterval(timer);
        reject(new Error(`npm start ended early:\n${output}`));
      }
    }, 100);
  });
  return { child, exited, output: () => output };
}

function pgRunning(): boolean {
  const bin = findPgBinDir()!;
  const asUser = process.getuid?.() === 0 ? ['runuser', '-u', 'postgres', '--'] : [];
  const cmd = [...asUser, path.join(bin, 'pg_ctl'), '-D', dataDir, 'status'];
  try {
    execFileSync(cmd[0]!, cmd.slice(1), { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
}

describe('npm start and its own PostgreSQL', () => {
  it('Ctrl+C stops the server it started, and a request prints no log line at info level', async () => {
    const app = await start();
    expect(app.output()).toContain('PostgreSQL started on 127.0.0.1');
    expect(pgRunning()).toBe(true);
    const before = app.output().length;
    expect((await fetch(`http://127.0.0.1:${webPort}/api/me`)).status).toBeLessThan(500);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(app.output().slice(before)).not.toContain('/api/me');

    kill(app.child, 'SIGINT');
    await app.exited;
    expect(app.output()).toContain('stopped');
    expect(pgRunning()).toBe(false);
  }, 180_000);

  it('after being killed outright, the next start recognises its own server and SIGTERM stops it', async () => {
    const first = await start();
    kill(first.child, 'SIGKILL');
    await first.exited;
    expect(pgRunning()).toBe(true);

    const second = await start('node');
    expect(second.output()).toContain('still running from an earlier npm start');
    // SIGTERM to the app's process alone, as a service manager sends it.
    process.kill(second.child.pid!, 'SIGTERM');
    await second.exited;
    expect(pgRunning()).toBe(false);
  }, 180_000);

  it('leaves running a server that `npm run db:start` started', async () => {
    await startPg({ dataDir, port: Number(env.ROWTALLY_DB_PORT), log: () => {} });
    const app = await start();
    expect(app.output()).not.toContain('still running from an earlier npm start');
    kill(app.child, 'SIGINT');
    await app.exited;
    expect(pgRunning()).toBe(true);
  }, 180_000);
});
