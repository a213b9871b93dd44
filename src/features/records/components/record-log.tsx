import type { ConflictDetails } from '@common/contracts/records';
import { flexRender, type Header } from '@tanstack/react-table';
import { type ReactNode, useState } from 'react';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { conflictOf, useDeleteRecord, useUndoDelete } from '../api/record-api';
import { ConflictNotice } from './conflict-notice';
import { RecordsNav } from './records-nav';
import { UndoToast } from './undo-toast';
import { ScrollRegion } from '@/components/ui/scroll-region';

/** The input style of a cell being edited in place. */
export const editCell = 'min-h-11 w-full rounded border border-leaf-300 bg-white px-2';
const filterControl = 'min-h-11 rounded-lg border border-leaf-300 bg-white px-2';
const filterLabel = 'flex flex-col gap-1 text-sm font-medium';

export function FilterSelect({
  label,
  value,
  onChange,
  children,
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  children: ReactNode;
}) {
  return (
    <label className={filterLabel}>
      {label}
      <select value={value} onChange={(e) => onChange(e.target.value)} className={filterControl}>
        {children}
      </select>
    </label>
  );
}

/** Every site of the trial, or all of them. */
export function SiteFilter({
  sites,
  value,
  onChange,
}: {
  sites: { id: string; name: string }[];
  value: string;
  onChange: (siteId: string) => void;
}) {
  return (
    <FilterSelect label="Site" value={value} onChange={onChange}>
      <option value="">All sites</option>
      {sites.map((s) => (
        <option key={s.id} value={s.id}>
          {s.name}
        </option>
      ))}
    </FilterSelect>
  );
}

export function FilterBar({ children }: { children: ReactNode }) {
  return (
    <div className="flex flex-wrap items-end gap-2 rounded-lg bg-white p-3 shadow-sm">
      {children}
    </div>
  );
}

export function FilterInput({
  label,
  value,
  onChange,
  type,
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  type?: 'date';
}) {
  return (
    <label className={filterLabel}>
      {label}
      <input
        type={type}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        className={filterControl}
      />
    </label>
  );
}

/** A column heading that sorts on click, with an arrow for the current order. */
export function SortButton<T>({
  header,
  className,
}: {
  header: Header<T, unknown>;
  className: string;
}) {
  const sorted = header.column.getIsSorted();
  return (
    <button type="button" onClick={header.column.getToggleSortingHandler()} className={className}>
      {flexRender(header.column.columnDef.header, header.getContext())}
      {sorted === 'asc' ? ' ▲' : sorted === 'desc' ? ' ▼' : ''}
    </button>
  );
}

/**
 * The mark on a record outside its trait's plausible range (common/plausibility.ts): a word and
 * a sign, not a colour alone, with the reason for screen readers and on hover. Nothing is refused.
 */
export function DoubtFlag({ doubts }: { doubts: readonly string[] }) {
  if (doubts.length === 0) return null;
  const why = doubts.join(' ');
  return (
    <span
      title={why}
      className="ml-1 inline-flex items-center gap-0.5 rounded border border-pod-500 bg-straw-50 px-1 text-xs font-semibold whitespace-nowrap text-loam-700"
    >
      <span aria-hidden="true">⚠</span> check
      <span className="sr-only">: {why}</span>
    </span>
  );
}

/** Save and Cancel for the row being edited. */
export function EditActions({
  onSave,
  onCancel,
  saving,
}: {
  onSave: () => void;
  onCancel: () => void;
  saving?: boolean;
}) {
  return (
    <>
      <button
        type="button"
        onClick={onSave}
        disabled={saving}
        className="min-h-11 rounded-lg bg-leaf-700 px-3 font-semibold text-white"
      >
        Save
      </button>
      <button type="button" onClick={onCancel} className="min-h-11 rounded-lg px-2 text-leaf-700">
        Cancel
      </button>
    </>
  );
}

/** Edit and Delete for a stored row. */
export function RowActions({
  onEdit,
  onDelete,
  editLabel,
  deleteLabel,
}: {
  onEdit: () => void;
  onDelete: () => void;
  editLabel?: string;
  deleteLabel?: string;
}) {
  return (
    <>
      <button
        type="button"
        onClick={onEdit}
        className="min-h-11 rounded-lg px-2 text-leaf-700 underline"
        aria-label={editLabel}
      >
        Edit
      </button>
      <button
        type="button"
        aria-label={deleteLabel}
        onClick={onDelete}
        className="min-h-11 rounded-lg px-2 text-frost-600 underline"
      >
        Delete
      </button>
    </>
  );
}

/** The state a record log keeps beside its table: a refused save, and the last deletion. */
export function useRecordLog<R extends { id: string }>(
  slug: string,
  table: Parameters<typeof useDeleteRecord>[1],
) {
  const [conflict, setConflict] = useState<ConflictDetails | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [deleted, setDeleted] = useState<R | null>(null);
  const remove = useDeleteRecord(slug, table);
  const undo = useUndoDelete(slug, table);
  return {
    conflict,
    setConflict,
    problem,
    setProblem,
    deleted,
    setDeleted,
    undo,
    /** A stale version shows the conflict notice; any other refusal its message. */
    refused(err: unknown) {
      const c = conflictOf(err);
      if (c) setConflict(c);
      else setProblem(err instanceof Error ? err.message : 'Not saved.');
    },
    async remove(record: R) {
      await remove.mutateAsync(record.id);
      setDeleted(record);
    },
  };
}

/**
 * The page around a record table: heading, records navigation, filters, the 409 notice of a
 * stale edit, the last refusal, loading and error states, and undo of the last deletion.
 */
export function RecordLogShell<R extends { id: string }>({
  heading,
  slug,
  filters,
  log,
  editing,
  onCancelEdit,
  onUseCurrent,
  query,
  loadingLabel,
  deletedMessage,
  children,
}: {
  heading: string;
  slug: string;
  filters: ReactNode;
  log: ReturnType<typeof useRecordLog<R>>;
  editing: boolean;
  onCancelEdit: () => void;
  onUseCurrent: (conflict: ConflictDetails) => void;
  query: { isPending: boolean; error: Error | null };
  loadingLabel: string;
  deletedMessage: (record: R) => string;
  children: ReactNode;
}) {
  const { conflict, problem, deleted, undo } = log;
  return (
    <article className="space-y-3">
      <h1 className="text-2xl font-semibold text-leaf-900">{heading}</h1>
      <RecordsNav slug={slug} />
      <FilterBar>{filters}</FilterBar>
      {conflict && editing ? (
        <ConflictNotice
          conflict={conflict}
          onCancel={() => {
            onCancelEdit();
            log.setConflict(null);
          }}
          onUseCurrent={() => {
            onUseCurrent(conflict);
            log.setConflict(null);
          }}
        />
      ) : null}
      {problem ? (
        <p role="alert" className="font-medium text-frost-600">
          {problem}
        </p>
      ) : null}
      {query.isPending ? (
        <Spinner label={loadingLabel} />
      ) : query.error ? (
        <ErrorPanel error={query.error} />
      ) : (
        <ScrollRegion label={heading} className="rounded-lg bg-white shadow-sm">
          {children}
        </ScrollRegion>
      )}
      {deleted ? (
        <UndoToast
          message={deletedMessage(deleted)}
          busy={undo.isPending}
          onClose={() => log.setDeleted(null)}
          onUndo={async () => {
            try {
              await undo.mutateAsync(deleted.id);
            } catch (err) {
              log.setProblem(err instanceof Error ? err.message : 'Could not undo.');
            }
            log.setDeleted(null);
          }}
        />
      ) : null}
    </article>
  );
}
