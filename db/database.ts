import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import type { Database } from './schema';

// `date` stays 'YYYY-MM-DD' text: a field date is a calendar day, not an instant in a time zone.
pg.types.setTypeParser(pg.types.builtins.DATE, (value) => value);
// bigint counts fit in a JS number for everything this app counts.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value));

export type DB = Kysely<Database>;

/**
 * A pool that outlives its server: when PostgreSQL restarts or a connection is cut (57P01
 * "terminating connection due to administrator command", a crash, a dropped test database),
 * pg raises an 'error' event on each affected client, idle or checked out. An unheard 'error'
 * event ends a Node process, so every client gets a listener the moment it connects; the query
 * in flight fails on its own, pg discards the broken client and the next query opens a new one.
 */
export function createPool(
  connectionString: string,
  max = 10,
  onConnectionLost: (err: Error) => void = () => {},
): pg.Pool {
  const pool = new pg.Pool({
    connectionString,
    max,
    // A request waits at most this long for a free connection, then is told to retry (503).
    connectionTimeoutMillis: 10_000,
  });
  // Each lost connection is reported once, by its client's listener; the pool's own 'error'
  // event (for idle clients) repeats it.
  pool.on('error', () => {});
  pool.on('connect', (client) => {
    client.on('error', onConnectionLost);
  });
  return pool;
}

export function createDb(pool: pg.Pool): DB {
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}
