import { type Kysely, type MigrationResultSet, Migrator, sql } from 'kysely';
import { migrations } from './migrations/index';

export function createMigrator(db: Kysely<any>): Migrator {
  // Branches merged in parallel can land a migration that sorts before one a database already
  // ran; each migration is independent of its neighbours by rule, so run it rather than refuse.
  return new Migrator({
    db,
    provider: { getMigrations: async () => migrations },
    allowUnorderedMigrations: true,
  });
}

function check({ error, results }: MigrationResultSet): void {
  const failed = results?.find((r) => r.status === 'Error');
  if (error || failed) {
    const cause = error instanceof Error ? error.message : String(error ?? '');
    throw new Error(`Migration ${failed?.migrationName ?? ''} failed: ${cause}`);
  }
}

/** Our own key for "migrating Rowtally's schema" among PostgreSQL's session advisory locks. */
const MIGRATION_LOCK = sql.lit(0x526f7754); // 'RowT'

/**
 * Migrate to the latest schema, once however many servers start together: the whole run,
 * including creating the migrator's own tables, holds one advisory lock on one connection, so
 * the others wait and then find nothing left to do.
 */
export async function migrateToLatest(db: Kysely<any>): Promise<string[]> {
  return db.connection().execute(async (conn) => {
    await sql`select pg_advisory_lock(${MIGRATION_LOCK})`.execute(conn);
    try {
      const result = await createMigrator(conn).migrateToLatest();
      check(result);
      return (result.results ?? []).map((r) => r.migrationName);
    } finally {
      await sql`select pg_advisory_unlock(${MIGRATION_LOCK})`.execute(conn);
    }
  });
}

/** Undo every migration, newest first. */
export async function migrateDownAll(db: Kysely<any>): Promise<string[]> {
  const migrator = createMigrator(db);
  const done: string[] = [];
  for (;;) {
    const result = await migrator.migrateDown();
    check(result);
    if (!result.results?.length) return done;
    done.push(...result.results.map((r) => r.migrationName));
  }
}
