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

/** A browser-like caller of the balancer's address: one cookie jar, the app's own Origin. */
export class Visitor {
  cookie: string | undefined;
  /** Every instance that answered this visitor, in order. */
  readonly answeredBy: string[] = [];
  constructor(readonly base: string) {}

  async call(method: string, url: string, body?: object | FormData): Promise<Answer> {
    const headers: Record<string, string> = { Origin: this.base };
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
