import { Router } from 'express';
import { sql } from 'kysely';
import type { AppDeps } from '../app-deps';

export function healthRouter({ db, version }: Pick<AppDeps, 'db' | 'version'>) {
  const router = Router();
  router.get('/', async (_req, res) => {
    const started = performance.now();
    let reachable = true;
    try {
      await sql`select 1`.execute(db);
    } catch {
      reachable = false;
    }
    const latencyMs = Math.round((performance.now() - started) * 10) / 10;
    res.status(reachable ? 200 : 503).json({
      status: reachable ? 'ok' : 'degraded',
      version,
      database: { reachable, latencyMs },
    });
  });
  return router;
}
