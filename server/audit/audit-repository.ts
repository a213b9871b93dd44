import { sql } from 'kysely';
import type { DB } from '../../db/database';
import type { AuditAction, AuditTable } from '../../db/schema';

export function listEntries(
  db: DB,
  trialId: string,
  q: {
    table?: AuditTable;
    recordId?: string;
    action?: AuditAction;
    limit: number;
    beforeId?: number;
  },
) {
  return db
    .selectFrom('audit_log as a')
    .leftJoin('users as u', 'u.id', 'a.actor_id')
    .select([
      'a.id',
      'a.table_name',
      'a.record_id',
      'a.action',
      'a.before',
      'a.after',
      'a.actor_id',
      'u.name as actor_name',
      'a.at',
      // restorable: the record is deleted now and this entry is its latest deletion
      sql<boolean>`a.action = 'delete' and a.id = (select max(b.id) from audit_log b where b.record_id = a.record_id)`.as(
        'is_latest_delete',
      ),
    ])
    .where('a.trial_id', '=', trialId)
    .$if(q.table !== undefined, (b) => b.where('a.table_name', '=', q.table!))
    .$if(q.recordId !== undefined, (b) => b.where('a.record_id', '=', q.recordId!))
    .$if(q.action !== undefined, (b) => b.where('a.action', '=', q.action!))
    .$if(q.beforeId !== undefined, (b) => b.where('a.id', '<', q.beforeId!))
    .orderBy('a.id', 'desc')
    .limit(q.limit + 1)
    .execute();
}
