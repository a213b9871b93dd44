import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import type { Database } from './schema';

// `date` stays 'YYYY-MM-DD' text: a field date is a calendar day, not an instant in a time zone.
pg.types.setTypeParser(pg.types.builtins.DATE, (value) => value);
// bigint counts fit in a JS number for everything this app counts.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value));

export type DB = Kysely<Database>;

/**
 * A pool whose idle connections may drop (server restart, a test database dropped) without
 * taking the process down: pg discards the broken client and the next query opens a new one.
 */
export function createPool(
  connectionString: string,
  max = 10,
  onIdleError: (err: Error) => void = () => {},
): pg.Pool {
  const pool = new pg.Pool({ connectionString, max });
  pool.on('error', onIdleError);
  return pool;
}

export function createDb(pool: pg.Pool): DB {
  return new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
}
