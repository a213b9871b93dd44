/** npm run db:start | db:stop | db:migrate | db:reset */
import { createStorage } from '../server/storage/create-storage';
import { sql } from 'kysely';
import { parseEnv } from '../server/env';
import { createDb, createPool } from './database';
import { dataDirOf, ensureDatabase } from './ensure-database';
import { migrateToLatest } from './migrator';
import { stopPg } from './pg-server';
import { seedDemoIfEmpty } from './seed/seed';

async function main(command: string | undefined) {
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
    default:
      throw new Error('Usage: tsx db/cli.ts start|stop|migrate|reset');
  }
}

main(process.argv[2]).catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
