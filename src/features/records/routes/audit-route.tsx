import type { AuditEntry } from '@common/contracts/records';
import { createColumnHelper } from '@tanstack/react-table';
import { useState } from 'react';
import { DataTable } from '@/components/ui/data-table';
import { useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useTrial } from '@/lib/trial';
import { useAuditLog, useRestoreRecord } from '../api/record-api';
import { RecordsNav } from '../components/records-nav';

const changeCol = createColumnHelper<{ field: string; entry: AuditEntry }>();
const tableWord: Record<AuditEntry['table'], string> = {
  harvests: 'Harvest',
  observations: 'Observation',
  field_events: 'Field event',
  plots: 'Plot stand count',
  traits: 'Trait',
};
const actionWord: Record<AuditEntry['action'], string> = {
  create: 'created',
  update: 'changed',
  delete: 'deleted',
  restore: 'restored',
};
const show = (v: unknown) => (v === null || v === undefined || v === '' ? '—' : String(v));

/** Who created, changed, deleted or restored each record, with before and after values. */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const [table, setTable] = useState('');
  const [action, setAction] = useState('');
  const log = useAuditLog(slug, { table: table || undefined, action: action || undefined });
  const restore = useRestoreRecord(slug);
  const [message, setMessage] = useState<string | null>(null);

  if (trial.isPending) return <Spinner />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const isLead = trial.data.permissions['trial.edit'];

  return (
    <article className="space-y-3">
      <h1 className="text-2xl font-semibold text-leaf-900">Audit log · {trial.data.title}</h1>
      <RecordsNav slug={slug} />
      <div className="flex flex-wrap items-end gap-2 rounded-lg bg-white p-3 shadow-sm">
        <label className="flex flex-col gap-1 text-sm font-medium">
          Records
          <select
            value={table}
            onChange={(e) => setTable(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          >
            <option value="">All</option>
            <option value="harvests">Harvests</option>
            <option value="observations">Observations</option>
            <option value="field_events">Field events</option>
            <option value="plots">Stand counts</option>
            <option value="traits">Traits</option>
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          What happened
          <select
            value={action}
            onChange={(e) => setAction(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          >
            <option value="">Anything</option>
            <option value="create">Created</option>
            <option value="update">Changed</option>
            <option value="delete">Deleted</option>
            <option value="restore">Restored</option>
          </select>
        </label>
      </div>
      {message ? (
        <p role="status" className="font-medium text-leaf-900">
          {message}
        </p>
      ) : null}
      {log.isPending ? (
        <Spinner label="Loading the audit log…" />
      ) : log.error ? (
        <ErrorPanel error={log.error} />
      ) : (
        <ol className="space-y-2">
          {log.data.entries.map((e) => (
            <li key={e.id} className="rounded-lg bg-white p-3 text-sm shadow-sm">
              <p>
                <span className="font-semibold">
                  {tableWord[e.table]} {actionWord[e.action]}
                </span>{' '}
                by {e.actorName ?? 'a removed account'} ·{' '}
                <time dateTime={e.at}>{new Date(e.at).toLocaleString()}</time>
              </p>
              <p className="text-loam-700">
                Record <code className="break-all">{e.recordId}</code>
              </p>
              {e.action === 'update' || e.action === 'delete' || e.action === 'restore' ? (
                e.changedFields.length ? (
                  <DataTable
                    className="mt-1"
                    sortable={false}
                    caption={`Fields changed in ${e.recordId}`}
                    data={e.changedFields.map((f) => ({ field: f, entry: e }))}
                    rowId={(r) => r.field}
                    rowHeader="field"
                    columns={[
                      changeCol.accessor('field', {
                        header: 'Field',
                        meta: { cellClassName: () => 'font-mono' },
                      }),
                      changeCol.display({
                        id: 'before',
                        header: 'Before',
                        cell: ({ row: { original: r } }) => show(r.entry.before?.[r.field]),
                      }),
                      changeCol.display({
                        id: 'after',
                        header: 'After',
                        cell: ({ row: { original: r } }) => show(r.entry.after[r.field]),
                      }),
                    ]}
                  />
                ) : null
              ) : (
                <p className="mt-1 break-words font-mono text-xs">
                  {Object.entries(e.after)
                    .filter(
                      ([k, v]) =>
                        ![
                          'trialId',
                          'createdAt',
                          'updatedAt',
                          'createdBy',
                          'updatedBy',
                          'deletedAt',
                        ].includes(k) &&
                        v !== null &&
                        v !== '',
                    )
                    .map(([k, v]) => `${k}: ${String(v)}`)
                    .join(' · ')}
                </p>
              )}
              {e.restorable && isLead && e.table !== 'plots' && e.table !== 'traits' ? (
                <button
                  type="button"
                  disabled={restore.isPending}
                  onClick={async () => {
                    try {
                      await restore.mutateAsync({
                        table: e.table as 'harvests',
                        recordId: e.recordId,
                      });
                      setMessage('Restored. The record is back in its log.');
                    } catch (err) {
                      setMessage(err instanceof Error ? err.message : 'Could not restore.');
                    }
                  }}
                  className="mt-2 min-h-11 rounded-lg bg-leaf-700 px-3 font-semibold text-white"
                >
                  Restore this record
                </button>
              ) : null}
            </li>
          ))}
        </ol>
      )}
    </article>
  );
}
