import crypto from 'node:crypto';
import pg from 'pg';
import { inject } from 'vitest';
import { createDb, createPool, type DB } from '../../db/database';

function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

async function admin(sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: inject('pgServerUrl') });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

export interface TestDatabase {
  url: string;
  db: DB;
  pool: pg.Pool;
  drop(): Promise<void>;
}

/** A fresh, migrated database of this test file's own (a copy of the run's template). */
export async function createTestDatabase(): Promise<TestDatabase> {
  const name = `t_${crypto.randomBytes(6).toString('hex')}`;
  await admin(`create database ${name} template ${inject('templateDb')}`);
  const url = withDatabase(inject('pgServerUrl'), name);
  const pool = createPool(url, 5);
  const db = createDb(pool);
  return {
    url,
    db,
    pool,
    async drop() {
      await db.destroy();
      await admin(`drop database if exists ${name} with (force)`);
    },
  };
}

/** An empty database with no tables, for migration tests. */
export async function createEmptyDatabase(): Promise<TestDatabase> {
  const name = `e_${crypto.randomBytes(6).toString('hex')}`;
  await admin(`create database ${name}`);
  const url = withDatabase(inject('pgServerUrl'), name);
  const pool = createPool(url, 2);
  const db = createDb(pool);
  return {
    url,
    db,
    pool,
    async drop() {
      await db.destroy();
      await admin(`drop database if exists ${name} with (force)`);
    },
  };
}
