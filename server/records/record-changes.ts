/**
 * The life of one stored record, the same for harvests, observations and field events:
 * create once per client-made id, update only from the version that was read, soft delete,
 * restore. Each change writes its audit entry in the caller's transaction.
 */
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import { latestEntry, snapshotAtVersion, writeAudit } from './record-audit-repository';
import { AppError } from '../lib/app-error';
import {
  insertRecordIfNew,
  type NewRecord,
  type RecordChange,
  recordById,
  type RecordRow,
  type RecordTable,
  updateRecord,
} from './records-repository';

const camel = (s: string) => s.replace(/_([a-z0-9])/g, (_m, c: string) => c.toUpperCase());
const bookkeeping = new Set(['version', 'updated_at', 'updated_by', 'created_at', 'created_by']);

const same = (a: unknown, b: unknown) =>
  JSON.stringify(a instanceof Date ? a.toISOString() : a) ===
  JSON.stringify(b instanceof Date ? b.toISOString() : b);

/** Columns whose values differ between two snapshots, as the API names them. */
export function differingFields(a: Record<string, unknown>, b: Record<string, unknown>): string[] {
  return Object.keys(b)
    .filter((k) => !bookkeeping.has(k) && !same(a[k], b[k]))
    .map(camel);
}

export const camelRecord = (row: Record<string, unknown>) =>
  Object.fromEntries(
    Object.entries(row).map(([k, v]) => [camel(k), v instanceof Date ? v.toISOString() : v]),
  );

export async function createOnce<T extends RecordTable>(
  trx: DB,
  table: T,
  trialId: string,
  values: NewRecord<T>,
  actor: Actor,
  /** columns that identify what the record is about; a reused id must match them */
  anchor: (keyof NewRecord<T> & keyof RecordRow<T>)[],
): Promise<{ row: RecordRow<T>; created: boolean }> {
  // The insert writes its audit entry in the same statement.
  const row = await insertRecordIfNew(trx, table, values, { trialId, actorId: actor.userId });
  if (row) return { row, created: true };
  const existing = (await recordById(trx, table, values.id))!;
  if (existing.trial_id !== trialId || anchor.some((k) => !same(existing[k], values[k]))) {
    throw new AppError('conflict', 'This record id is already used by a different record.', {
      fields: [{ path: 'body.id', message: 'Make a new id for a new record.' }],
    });
  }
  // A retry of a record already stored: answer with what is stored, change nothing.
  return { row: existing, created: false };
}

export async function lockedRecord<T extends RecordTable>(
  trx: DB,
  table: T,
  trialId: string,
  id: string,
) {
  const row = await recordById(trx, table, id, true);
  if (!row || row.trial_id !== trialId) throw AppError.notFound('The record');
  return row;
}

/** 409 with the stored record and what changed since the version the caller read. */
export async function staleVersion<T extends RecordTable>(
  db: DB,
  current: RecordRow<T>,
  yourVersion: number,
  proposed: Record<string, unknown>,
): Promise<never> {
  const seen = await snapshotAtVersion(db, current.id, yourVersion);
  const changedFields = seen
    ? differingFields(seen, current)
    : differingFields(current, proposed).filter((f) => f in camelRecord(proposed));
  throw new AppError(
    'conflict',
    `Someone else changed this record since you opened it (${changedFields.join(', ') || 'no values'} changed). Check the values now stored and save again.`,
    { current: camelRecord(current), changedFields, yourVersion, currentVersion: current.version },
  );
}

export async function applyUpdate<T extends RecordTable>(
  trx: DB,
  table: T,
  before: RecordRow<T>,
  values: RecordChange<T>,
  actor: Actor,
): Promise<RecordRow<T>> {
  if (differingFields(before, { ...before, ...values }).length === 0) return before;
  const after = await updateRecord(trx, table, before.id, values, actor.userId);
  await writeAudit(trx, {
    trialId: before.trial_id,
    table,
    recordId: before.id,
    action: 'update',
    before,
    after,
    actorId: actor.userId,
  });
  return after;
}

/** Soft delete (`deletedAt` set) or restore (cleared), with its audit entry. */
async function setDeleted<T extends RecordTable>(
  trx: DB,
  table: T,
  before: RecordRow<T>,
  actor: Actor,
  action: 'delete' | 'restore',
) {
  const deletedAt = action === 'delete' ? new Date() : null;
  const after = await updateRecord(trx, table, before.id, { deleted_at: deletedAt }, actor.userId);
  await writeAudit(trx, {
    trialId: before.trial_id,
    table,
    recordId: before.id,
    action,
    before,
    after,
    actorId: actor.userId,
  });
  return after;
}

export async function softDelete<T extends RecordTable>(
  trx: DB,
  table: T,
  before: RecordRow<T>,
  actor: Actor,
) {
  if (before.deleted_at) return before;
  return setDeleted(trx, table, before, actor, 'delete');
}

export async function restore<T extends RecordTable>(
  trx: DB,
  table: T,
  before: RecordRow<T>,
  actor: Actor,
) {
  if (!before.deleted_at) throw new AppError('conflict', 'This record is not deleted.');
  return setDeleted(trx, table, before, actor, 'restore');
}

/** Undo of one's own deletion lasts this long; after that the lead restores it. */
export const UNDO_WINDOW_MS = 15 * 60 * 1000;

export async function mayUndo(db: DB, recordId: string, actor: Actor, now = Date.now()) {
  const last = await latestEntry(db, recordId);
  return (
    last?.action === 'delete' &&
    last.actor_id === actor.userId &&
    now - new Date(last.at).getTime() <= UNDO_WINDOW_MS
  );
}
