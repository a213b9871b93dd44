/**
 * What the tests through the balancer share: a cluster of built instances behind nginx on free
 * loopback ports in a temporary folder (scripts/cluster/cluster.ts), the demo season in its
 * database, and a visitor that keeps its session cookie and notes which instance answered.
 */
import { execFileSync } from 'node:child_process';
import { createDb, createPool, type DB } from '../../db/database';
import { seedDemo } from '../../db/seed/seed';
import { projectRoot } from '../../server/env';
import { UPSTREAM_HEADER } from '../../scripts/cluster/balancer';
import { type Cluster, startThrowawayCluster } from '../../scripts/cluster/cluster';

export interface TestCluster {
  cluster: Cluster;
  db: DB;
  close(): Promise<void>;
}

export async function startTestCluster(instances: number): Promise<TestCluster> {
  // The instances run the built server, as in production; esbuild takes a few seconds.
  execFileSync('npm', ['run', '--silent', 'build:server'], { cwd: projectRoot, stdio: 'inherit' });
  const cluster = await startThrowawayCluster(instances, { healthIntervalMs: 500 });
  const db = createDb(createPool(cluster.databaseUrl, 4));
  await seedDemo(db);
  return {
    cluster,
    db,
    async close() {
      await db.destroy();
      await cluster.stop();
    },
  };
}

export interface Answer {
  status: number;
  body: any;
  bytes: Buffer;
  /** The instance (address:port) that answered, as the balancer names it. */
  upstream: string;
  headers: Headers;
}

/**
 * A browser-like caller of the balancer's address: one cookie jar, the app's own Origin.
 * With `keepAlive: false` each request goes on a connection of its own. A browser sends a
 * request again by itself when a kept-alive connection it reused turns out to be closed by the
 * server before the request was read (RFC 9112 §9.3.1); fetch here does not, and nginx's old
 * worker closes its idle connections at every reload, so a caller that must show that no request
 * fails opens a connection per request: then any failure is the balancer's or an instance's.
 */
export class Visitor {
  cookie: string | undefined;
  /** Every instance that answered this visitor, in order. */
  readonly answeredBy: string[] = [];
  constructor(
    readonly base: string,
    readonly opts: { keepAlive?: boolean } = {},
  ) {}

  async call(method: string, url: string, body?: object | FormData): Promise<Answer> {
    const headers: Record<string, string> = { Origin: this.base };
    if (this.opts.keepAlive === false) headers.Connection = 'close';
    if (this.cookie) headers.Cookie = this.cookie;
    if (body && !(body instanceof FormData)) headers['Content-Type'] = 'application/json';
    const res = await fetch(this.base + url, {
      method,
      headers,
      body: body instanceof FormData ? body : body ? JSON.stringify(body) : undefined,
    });
    const session = res.headers.getSetCookie().find((c) => c.startsWith('rowtally.session_token='));
    if (session) this.cookie = session.split(';')[0];
    const bytes = Buffer.from(await res.arrayBuffer());
    const type = res.headers.get('content-type') ?? '';
    const upstream = res.headers.get(UPSTREAM_HEADER) ?? '';
    this.answeredBy.push(upstream);
    return {
      status: res.status,
      body: type.includes('json') ? JSON.parse(bytes.toString('utf8')) : null,
      bytes,
      upstream,
      headers: res.headers,
    };
  }

  async signIn(email: string, password: string): Promise<Answer> {
    return this.call('POST', '/api/auth/sign-in/email', { email, password });
  }
}

/**
 * Sends a write until it is acknowledged (2xx), as the field log's outbox does: a refused
 * connection or a 502 from an instance that died is sent again with the same record id.
 * Returns the acknowledging answer and how many tries it took.
 */
export async function untilAcknowledged(
  send: () => Promise<Answer>,
  maxTries = 20,
): Promise<{ answer: Answer; tries: number }> {
  let lastError = '';
  for (let tries = 1; tries <= maxTries; tries++) {
    try {
      const answer = await send();
      if (answer.status >= 200 && answer.status < 300) return { answer, tries };
      lastError = `${answer.status} ${answer.bytes.toString('utf8').slice(0, 200)}`;
      if (answer.status < 500) break;
    } catch (err) {
      lastError = String(err);
    }
    await new Promise((r) => setTimeout(r, 100 * tries));
  }
  throw new Error(`not acknowledged: ${lastError}`);
}

/**
 * Asks until every instance has answered, as long as each answer passes `check`; on a busy
 * machine nginx may skip an instance for a few seconds after a failed connection
 * (`max_fails`/`fail_timeout`), so this waits for the state rather than counting on the order.
 */
export async function untilEachInstanceAnswers(
  t: TestCluster,
  ask: () => Promise<Answer>,
  check: (answer: Answer) => void,
  timeoutMs = 60_000,
): Promise<Set<string>> {
  const wanted = t.cluster.instances.map((i) => i.port);
  const seen = new Set<string>();
  const deadline = Date.now() + timeoutMs;
  while (!wanted.every((port) => [...seen].some((a) => a.endsWith(`:${port}`)))) {
    if (Date.now() > deadline)
      throw new Error(`only ${[...seen].join(', ')} answered in ${timeoutMs / 1000} s`);
    const answer = await ask();
    check(answer);
    seen.add(answer.upstream);
  }
  return seen;
}

/** Waits until `done()` holds, checking every 200 ms, or fails naming `what`. */
export async function until(what: string, done: () => boolean, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  while (!done()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting until ${what}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}
