import { Router } from 'express';
import { sql } from 'kysely';
import type { AppDeps } from '../app-deps';

/** A check that has not answered in this long counts as unreachable. */
const CHECK_TIMEOUT_MS = 2000;

async function probe(check: () => Promise<unknown>) {
  const started = performance.now();
  let timer: NodeJS.Timeout | undefined;
  let reachable = true;
  try {
    await Promise.race([
      check(),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error('timed out')), CHECK_TIMEOUT_MS);
      }),
    ]);
  } catch {
    reachable = false;
  } finally {
    clearTimeout(timer);
  }
  return { reachable, latencyMs: Math.round((performance.now() - started) * 10) / 10 };
}

/** /api/health: the process answers, and says whether the database does (503 while it is away). */
export function healthRouter({ db, version }: Pick<AppDeps, 'db' | 'version'>) {
  const router = Router();
  router.get('/', async (_req, res) => {
    const database = await probe(() => sql`select 1`.execute(db));
    res.status(database.reachable ? 200 : 503).json({
      status: database.reachable ? 'ok' : 'degraded',
      version,
      database,
    });
  });
  return router;
}

/**
 * /api/ready: whether this process should be sent requests — the database and the photo
 * storage answer, and it is not shutting down. A load balancer routes by this one.
 */
export function readyRouter({
  db,
  storage,
  version,
  lifecycle,
}: Pick<AppDeps, 'db' | 'storage' | 'version' | 'lifecycle'>) {
  const router = Router();
  router.get('/', async (_req, res) => {
    const [database, store] = await Promise.all([
      probe(() => sql`select 1`.execute(db)),
      probe(() => storage.check()),
    ]);
    const draining = lifecycle.draining;
    const ready = database.reachable && store.reachable && !draining;
    res.status(ready ? 200 : 503).json({
      status: ready ? 'ready' : draining ? 'shutting_down' : 'not_ready',
      version,
      database,
      storage: { driver: storage.driver, ...store },
    });
  });
  return router;
}
