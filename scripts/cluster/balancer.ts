/**
 * Debian's nginx as the load balancer of the local cluster: an instance of our own
 * (`nginx -c FILE -p DIR`, never the system service), round robin over the app instances with no
 * sticky sessions. Open-source nginx has no active health checks, so the cluster polls each
 * instance's /api/ready and rewrites the upstream list here (a reload, which nginx does without
 * dropping requests); between two polls, a refused connection is retried on the next instance.
 */
import { type ChildProcess, spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';

export const NGINX_BIN = '/usr/sbin/nginx';

/** The response header naming the instance (address and port) that answered. */
export const UPSTREAM_HEADER = 'x-rowtally-upstream';

export interface Upstream {
  port: number;
  /** Not ready (or being restarted): sent nothing. */
  down: boolean;
}

export interface BalancerConfig {
  /** Holds the configuration, logs, pid file and nginx's temporary files. */
  dir: string;
  port: number;
  upstreams: Upstream[];
  /** The user nginx's workers run as when started by root (they write request bodies to disk). */
  workerUser?: string;
}

const isRoot = () => process.getuid?.() === 0;

/** Photos are refused by the app itself above its own limit, with a clear message; this only caps abuse. */
const MAX_BODY = '100m';

export function nginxConfig(c: BalancerConfig & { tmp: string }): string {
  const tmp = c.tmp;
  // Every instance down is a state the watcher can be wrong about: nginx then tries them all.
  const allDown = c.upstreams.every((u) => u.down);
  const servers = c.upstreams
    .map(
      (u) =>
        `    server 127.0.0.1:${u.port} max_fails=1 fail_timeout=3s${u.down && !allDown ? ' down' : ''};`,
    )
    .join('\n');
  return `# Written by the cluster command; rewritten whenever an instance's readiness changes.
${isRoot() ? `user ${c.workerUser ?? 'nobody nogroup'};\n` : ''}daemon off;
worker_processes 1;
pid ${path.join(c.dir, 'nginx.pid')};
error_log ${path.join(c.dir, 'error.log')} notice;
events { worker_connections 1024; }
http {
  log_format upstreams '$remote_addr [$time_iso8601] "$request" $status $upstream_addr $request_time';
  access_log ${path.join(c.dir, 'access.log')} upstreams;
  client_body_temp_path ${tmp}/body;
  proxy_temp_path ${tmp}/proxy;
  fastcgi_temp_path ${tmp}/fastcgi;
  uwsgi_temp_path ${tmp}/uwsgi;
  scgi_temp_path ${tmp}/scgi;
  client_max_body_size ${MAX_BODY};
  server_tokens off;

  # Round robin (nginx's default), no sticky sessions: any instance may answer any request.
  upstream rowtally {
${servers}
  }

  server {
    listen 127.0.0.1:${c.port};
    location / {
      proxy_pass http://rowtally;
      proxy_set_header Host $http_host;
      proxy_set_header X-Forwarded-For $proxy_add_x_forwarded_for;
      proxy_set_header X-Forwarded-Proto $scheme;
      # A refused connection or a stopping instance: the next one is tried. nginx never resends a
      # POST that reached an instance; the client replays it (record ids make that safe).
      proxy_next_upstream error timeout http_502 http_503 http_504;
      proxy_connect_timeout 2s;
      proxy_read_timeout 120s;
      proxy_buffering on;
      add_header X-Rowtally-Upstream $upstream_addr always;
    }
  }
}
`;
}

export interface Balancer {
  url: string;
  /**
   * Writes a new upstream list and waits until nginx uses only it (nothing when the list is the
   * one in use).
   */
  setUpstreams(upstreams: Upstream[]): Promise<void>;
  /** The instances nginx sends requests to under the list in use. */
  inService(): Upstream[];
  stop(): Promise<void>;
  /** Stops nginx without waiting (its fast shutdown), for a second Ctrl+C. */
  kill(): void;
}

function portAnswers(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect(port, '127.0.0.1');
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
  });
}

const count = (text: string, word: string) => text.split(word).length - 1;

/** What an old worker writes to the error log (level notice) when a reload tells it to stop. */
const OLD_WORKER_LEAVES = 'gracefully shutting down';
/** Generous: on a loaded machine starting a worker can take seconds. */
const RELOAD_TIMEOUT_MS = 30_000;

export async function startBalancer(config: BalancerConfig): Promise<Balancer> {
  const dir = path.resolve(config.dir);
  fs.mkdirSync(dir, { recursive: true });
  // The workers write large request bodies (photos) here: under /tmp, so they can reach it
  // whatever the permissions of the project's folders.
  const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-nginx-'));
  if (isRoot()) {
    const [user, group] = (config.workerUser ?? 'nobody nogroup').split(' ');
    fs.chownSync(tmp, uidOf(user!), gidOf(group ?? user!));
  }
  const confFile = path.join(dir, 'nginx.conf');
  const errorLog = path.join(dir, 'error.log');
  let current = { ...config, dir, tmp };
  fs.writeFileSync(confFile, nginxConfig(current));

  let output = '';
  const child: ChildProcess = spawn(NGINX_BIN, ['-c', confFile, '-p', dir, '-e', errorLog], {
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout!.on('data', (d: Buffer) => (output += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (output += d.toString()));
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));

  const deadline = Date.now() + 20_000;
  while (!(await portAnswers(config.port))) {
    if (child.exitCode !== null || Date.now() > deadline) {
      child.kill('SIGKILL');
      fs.rmSync(tmp, { recursive: true, force: true });
      const log = fs.existsSync(errorLog) ? fs.readFileSync(errorLog, 'utf8') : '';
      throw new Error(`nginx did not start:\n${output}${log.split('\n').slice(-6).join('\n')}`);
    }
    await new Promise((r) => setTimeout(r, 100));
  }

  const logged = (line: string) => count(fs.readFileSync(errorLog, 'utf8'), line);
  let queue = Promise.resolve();
  return {
    url: `http://127.0.0.1:${config.port}`,
    inService: () =>
      current.upstreams.every((u) => u.down)
        ? current.upstreams
        : current.upstreams.filter((u) => !u.down),
    setUpstreams(upstreams) {
      // One reload at a time. nginx's master starts a worker with the new list, then tells the
      // old one to stop taking connections (it finishes what it is answering); only once the old
      // one says so is the new list the only one in use — an instance taken out can then be stopped.
      const reload = queue
        .catch(() => {})
        .then(async () => {
          if (JSON.stringify(upstreams) === JSON.stringify(current.upstreams)) return;
          current = { ...current, upstreams };
          fs.writeFileSync(confFile, nginxConfig(current));
          const before = logged(OLD_WORKER_LEAVES);
          child.kill('SIGHUP');
          const until = Date.now() + RELOAD_TIMEOUT_MS;
          while (logged(OLD_WORKER_LEAVES) <= before) {
            if (Date.now() > until || child.exitCode !== null)
              throw new Error(
                `nginx did not take the new upstream list:\n${fs.readFileSync(errorLog, 'utf8').split('\n').slice(-6).join('\n')}`,
              );
            await new Promise((r) => setTimeout(r, 50));
          }
        });
      queue = reload;
      return reload;
    },
    kill() {
      if (child.exitCode === null) child.kill('SIGTERM');
    },
    async stop() {
      if (child.exitCode === null) {
        // SIGQUIT: finish the requests in flight, then exit.
        child.kill('SIGQUIT');
        const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
        await exited;
        clearTimeout(timer);
      }
      fs.rmSync(tmp, { recursive: true, force: true });
    },
  };
}

function idOf(db: string, name: string): number {
  const line = fs
    .readFileSync(db, 'utf8')
    .split('\n')
    .find((l) => l.startsWith(`${name}:`));
  if (!line) throw new Error(`No ${name} in ${db}.`);
  return Number(line.split(':')[2]);
}
const uidOf = (user: string) => idOf('/etc/passwd', user);
const gidOf = (group: string) => idOf('/etc/group', group);
