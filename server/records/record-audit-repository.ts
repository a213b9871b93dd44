/**
 * The audit trail as the records feature writes it, in the same transaction as the change
 * (server/audit reads it back for the history page).
 */
import { sql } from 'kysely';
import type { DB } from '../../db/database';
import type { AuditAction, AuditTable } from '../../db/schema';

type Row = Record<string, unknown>;

/** JSON for jsonb: dates as ISO text so before/after read the same as the API. */
const snapshot = (row: Row | null) =>
  row === null
    ? null
    : JSON.stringify(row, (_k, v: unknown) => (v instanceof Date ? v.toISOString() : v));

export async function writeAudit(
  trx: DB,
  entry: {
    trialId: string;
    table: AuditTable;
    recordId: string;
    action: AuditAction;
    before: Row | null;
    after: Row;
    actorId: string | null;
  },
): Promise<void> {
  await trx
    .insertInto('audit_log')
    .values({
      trial_id: entry.trialId,
      table_name: entry.table,
      record_id: entry.recordId,
      action: entry.action,
      before: snapshot(entry.before),
      after: snapshot(entry.after)!,
      actor_id: entry.actorId,
    })
    .execute();
}

/** The record as it stood at a version (the `after` of the change that made that version). */
export async function snapshotAtVersion(db: DB, recordId: string, version: number) {
  const row = await db
    .selectFrom('audit_log')
    .select('after')
    .where('record_id', '=', recordId)
    .where(sql<boolean>`(after->>'version')::int = ${version}`)
    .orderBy('id', 'desc')
    .executeTakeFirst();
  return row?.after ?? null;
}

export async function latestEntry(db: DB, recordId: string) {
  return db
    .selectFrom('audit_log')
    .selectAll()
    .where('record_id', '=', recordId)
    .orderBy('id', 'desc')
    .executeTakeFirst();
}
