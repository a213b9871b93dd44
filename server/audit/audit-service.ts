import type { z } from 'zod';
import {
  type auditQuery,
  restorableTables,
  type restoreBody,
} from '../../common/contracts/records';
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import { camelRecord, differingFields } from '../records/record-changes';
import { leadRestore } from '../records/records-service';
import { trialForAction } from '../trials/trials-service';
import { listEntries } from './audit-repository';

export async function auditLog(
  db: DB,
  slug: string,
  actor: Actor | null,
  q: z.output<typeof auditQuery>,
) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  const rows = await listEntries(db, trial.id, q);
  const page = rows.slice(0, q.limit);
  return {
    entries: page.map((r) => ({
      id: r.id,
      table: r.table_name,
      recordId: r.record_id,
      action: r.action,
      before: r.before ? camelRecord(r.before) : null,
      after: camelRecord(r.after),
      changedFields: r.before ? differingFields(r.before, r.after) : [],
      actorId: r.actor_id,
      actorName: r.actor_name,
      at: new Date(r.at).toISOString(),
      restorable:
        r.is_latest_delete && (restorableTables as readonly string[]).includes(r.table_name),
    })),
    nextBeforeId: rows.length > q.limit ? page.at(-1)!.id : null,
  };
}

export function restoreRecord(
  db: DB,
  slug: string,
  actor: Actor | null,
  body: z.output<typeof restoreBody>,
) {
  return leadRestore(db, slug, actor, body.table, body.recordId);
}
