/** npm run db:start | db:stop | db:migrate | db:reset | db:backup [DIR] | db:restore FILE */
import { createStorage } from '../server/storage/create-storage';
import { sql } from 'kysely';
import { parseEnv } from '../server/env';
import { backup, restore } from './backup';
import { createDb, createPool } from './database';
import { dataDirOf, ensureDatabase } from './ensure-database';
import path from 'node:path';
import { projectRoot } from '../server/env';
import { migrateToLatest } from './migrator';
import { stopPg } from './pg-server';
import { seedDemoIfEmpty } from './seed/seed';

async function main(command: string | undefined, arg: string | undefined) {
  const env = parseEnv();
  switch (command) {
    case 'start': {
      const { url } = await ensureDatabase(env);
      console.log(`Database ready: ${url}`);
      return;
    }
    case 'stop':
      if (env.DATABASE_URL) console.log('DATABASE_URL is set: that server is not ours to stop.');
      else stopPg(dataDirOf(env));
      return;
    case 'migrate':
    case 'reset': {
      const { url } = await ensureDatabase(env);
      const pool = createPool(url, 2);
      const db = createDb(pool);
      try {
        if (command === 'reset') {
          await sql`drop schema public cascade; create schema public`.execute(db);
          console.log('Dropped every table.');
        }
        const applied = await migrateToLatest(db);
        console.log(applied.length ? `Applied: ${applied.join(', ')}` : 'Already up to date.');
        if (command === 'reset') {
          const seeded = await seedDemoIfEmpty(db, createStorage(env));
          if (seeded) console.log('Loaded the demo season.');
        }
      } finally {
        await db.destroy();
      }
      return;
    }
    case 'backup': {
      const { url } = await ensureDatabase(env);
      const outDir = path.resolve(arg ?? path.join(projectRoot, 'backups'));
      const { file, manifest } = await backup({
        databaseUrl: url,
        storage: createStorage(env),
        outDir,
      });
      const what =
        manifest.storageDriver === 'local'
          ? `${manifest.objects.length} photo files`
          : `the listing of ${manifest.objects.length} objects in the bucket (their bytes stay in the bucket)`;
      console.log(`Backup written: ${file}\n  the database and ${what}.`);
      return;
    }
    case 'restore': {
      if (!arg) throw new Error('Usage: npm run db:restore FILE');
      const { url } = await ensureDatabase(env);
      const result = await restore({ file: arg, databaseUrl: url, storage: createStorage(env) });
      console.log(
        `Restored ${arg} (made ${result.manifest.createdAt}): ${result.tables} tables and sequences, ` +
          (result.manifest.storageDriver === 'local'
            ? `${result.photosRestored} photo files.`
            : `no photo files (the archive lists ${result.manifest.objects.length} objects that must be in the bucket).`),
      );
      return;
    }
    default:
      throw new Error('Usage: tsx db/cli.ts start|stop|migrate|reset|backup [DIR]|restore FILE');
  }
}

main(process.argv[2], process.argv[3]).catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
