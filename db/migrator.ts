import type { Kysely } from 'kysely';
import { type MigrationResultSet, Migrator } from 'kysely';
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

export async function migrateToLatest(db: Kysely<any>): Promise<string[]> {
  const result = await createMigrator(db).migrateToLatest();
  check(result);
  return (result.results ?? []).map((r) => r.migrationName);
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
