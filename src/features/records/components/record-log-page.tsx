/**
 * One record log page, for any kind of record: filters kept in the address (site, dates, the
 * kind's own choice, a search), one page of rows from the server newest first, a pager, edit
 * in place with the version read (a stale save shows what changed), delete with undo.
 */
import type { ConflictDetails, LogSortKey } from '@common/contracts/records';
import { type ColumnDef, createColumnHelper, type SortingState } from '@tanstack/react-table';
import { keepPreviousData, type QueryKey, useQuery } from '@tanstack/react-query';
import { type ReactNode, useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { useParams, useSearchParams } from 'react-router-dom';
import type { z } from 'zod';
import { DataTable } from '@/components/ui/data-table';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Spinner } from '@/components/ui/spinner';
import { type TrialWithPermissions, useTrial } from '@/lib/trial';
import { conflictOf, useDeleteRecord, useUndoDelete } from '../api/record-api';
import { ConflictNotice } from './conflict-notice';
import {
  EditActions,
  FilterBar,
  FilterInput,
  FilterSelect,
  RowActions,
  SiteFilter,
} from './record-log';
import { RecordsNav } from './records-nav';
import { UndoToast } from './undo-toast';

/** A column of the log: how a stored row shows, and the input that edits it in place. */
export interface LogColumn<R, D> {
  header: string;
  cell: (row: R) => ReactNode;
  edit?: (draft: D, change: (next: D) => void, row: R) => ReactNode;
  /** The server's sort key when the log can be sorted by this column (across every page). */
  sort?: LogSortKey;
  /** Numbers line up on the right. */
  align?: 'right';
}

/** The filters a log page is asked for, as the address holds them. */
export interface LogFilters {
  siteId?: string;
  from?: string;
  to?: string;
  q?: string;
  page: number;
  [choice: string]: string | number | undefined;
}

/**
 * How one page of rows shows: its columns (a unit chosen from the values on the page), the
 * caption (how many match, and any total over every page) and a row's draft for editing.
 */
export interface LogView<R, D> {
  rows: R[];
  summary: string;
  columns: LogColumn<R, D>[];
  toDraft: (row: R) => D;
}
type LogAnswer<R, D> = LogView<R, D> & PageOf;

/** a two-factor trial's record also names its plot's level of the treatment */
type Stored = { id: string; version: number; treatment?: string | null };
/** Where a page stands, as every log endpoint answers it. */
type PageOf = { total: number; page: number; limit: number };

/** What differs between the logs: their rows, columns, filter choice, edit and save. */
export interface RecordLogKind<R extends Stored, D, T extends PageOf = PageOf> {
  title: string;
  table: 'harvests' | 'observations';
  loadingLabel: string;
  /** The endpoint's query contract: filters are checked here before anything is asked. */
  query: z.ZodType;
  /** The log's own filter, a choice among a few values (grade, trait). */
  choice: { field: string; label: string; all: string; options: [string, string][] };
  searchLabel: string;
  /** The endpoint's query for one page (its key rooted at the trial). */
  list: (filters: LogFilters) => { queryKey: QueryKey; queryFn: () => Promise<T> };
  /** How an answer shows. */
  answer: (data: T) => LogView<R, D>;
  /** The row in words, for its buttons' names and the deletion notice. */
  rowName: (row: R) => string;
  /** The draft refilled from the record as stored now (after a 409). */
  fromStored: (current: Record<string, unknown>, draft: D) => D;
  save: (row: R, draft: D, version: number) => Promise<unknown>;
  saving: boolean;
}

/** Filters typed into the search box reach the address after this pause. */
const SEARCH_PAUSE_MS = 300;
const filterFields = ['siteId', 'from', 'to', 'q', 'sort', 'order'] as const;

/** The order the address asks for, as the table's sort state: newest first unless it says. */
function sortingOf(filters: LogFilters): SortingState {
  const by = String(filters.sort ?? 'date');
  return [{ id: by, desc: filters.order ? filters.order === 'desc' : by === 'date' }];
}

/** The filters in the address, with the page (from 1). */
function useLogFilters(choiceField: string) {
  const [params, setParams] = useSearchParams();
  const filters: LogFilters = { page: Number(params.get('page') ?? '1') || 1 };
  for (const f of [...filterFields, choiceField]) {
    const v = params.get(f);
    if (v) filters[f] = v;
  }
  const set = useCallback(
    (field: string, value: string) =>
      setParams(
        (p) => {
          const next = new URLSearchParams(p);
          if (value) next.set(field, value);
          else next.delete(field);
          // Another filter is another list: start it from its first page.
          if (field !== 'page') next.delete('page');
          return next;
        },
        { replace: true },
      ),
    [setParams],
  );
  /** Another order starts from the first page again. */
  const setSort = useCallback(
    (by: string, desc: boolean) =>
      setParams(
        (p) => {
          const next = new URLSearchParams(p);
          next.set('sort', by);
          next.set('order', desc ? 'desc' : 'asc');
          next.delete('page');
          return next;
        },
        { replace: true },
      ),
    [setParams],
  );
  return [filters, set, setSort] as const;
}

/** The route around a log: the trial, then the log once it is loaded. */
export function RecordLogRoute<R extends Stored, D, T extends PageOf>({
  useKind,
}: {
  useKind: (slug: string, trial: TrialWithPermissions) => RecordLogKind<R, D, T>;
}) {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  if (trial.isPending) return <Spinner />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  return <RecordLog slug={slug} trial={trial.data} useKind={useKind} />;
}

function RecordLog<R extends Stored, D, T extends PageOf>({
  slug,
  trial,
  useKind,
}: {
  slug: string;
  trial: TrialWithPermissions;
  useKind: (slug: string, trial: TrialWithPermissions) => RecordLogKind<R, D, T>;
}) {
  const kind = useKind(slug, trial);
  const [filters, setFilter, setSort] = useLogFilters(kind.choice.field);
  const checked = kind.query.safeParse(filters);
  const list = useQuery({
    ...kind.list(filters),
    enabled: checked.success,
    // The page shown stays while the next one is on its way.
    placeholderData: keepPreviousData,
  });
  const [search, setSearch] = useState(filters.q ?? '');
  useEffect(() => {
    if (search.trim() === (filters.q ?? '')) return;
    const timer = setTimeout(() => setFilter('q', search.trim()), SEARCH_PAUSE_MS);
    return () => clearTimeout(timer);
  }, [search, filters.q, setFilter]);

  const [draft, setDraft] = useState<Draft<D> | null>(null);
  const [conflict, setConflict] = useState<ConflictDetails | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [deleted, setDeleted] = useState<R | null>(null);
  const remove = useDeleteRecord(slug, kind.table);
  const undo = useUndoDelete(slug, kind.table);
  const canWrite = trial.permissions['records.write'] ?? false;
  const heading = `${kind.title} · ${trial.title}`;

  const startEdit = (row: R) => {
    setConflict(null);
    setProblem(null);
    if (data) setDraft({ id: row.id, version: row.version, values: data.toDraft(row) });
  };
  const save = async (row: R) => {
    if (!draft) return;
    setProblem(null);
    try {
      await kind.save(row, draft.values, draft.version);
      setDraft(null);
      setConflict(null);
    } catch (err) {
      const stale = conflictOf(err);
      if (stale) setConflict(stale);
      else setProblem(err instanceof Error ? err.message : 'Not saved.');
    }
  };
  const deleteRow = async (row: R) => {
    setProblem(null);
    try {
      await remove.mutateAsync(row.id);
      setDeleted(row);
    } catch (err) {
      setProblem(err instanceof Error ? err.message : 'Not deleted.');
    }
  };

  const data: LogAnswer<R, D> | undefined = list.data && {
    total: list.data.total,
    page: list.data.page,
    limit: list.data.limit,
    ...kind.answer(list.data),
  };
  // The table draws each cell as a component: cells made anew at every render would remount
  // the input being typed in, so the columns keep their identity while their shape is the
  // same, and the cells read the page's columns and the draft at render time.
  const live = useRef<LiveLog<R, D>>(null!);
  live.current = {
    columns: data ? withTreatment(data.columns, trial.factor?.name) : [],
    draft,
    setDraft,
    actions: canWrite
      ? (row, editing) =>
          editing ? (
            <EditActions
              onSave={() => void save(row)}
              onCancel={() => setDraft(null)}
              saving={kind.saving}
            />
          ) : (
            <RowActions
              onEdit={() => startEdit(row)}
              onDelete={() => void deleteRow(row)}
              editLabel={`Edit ${kind.rowName(row)}`}
              deleteLabel={`Delete ${kind.rowName(row)}`}
            />
          )
      : null,
  };
  const shape = live.current.columns
    .map((c) => `${c.sort ?? ''}\t${c.header}\t${c.align ?? ''}\t${c.edit ? 1 : 0}`)
    .join('\n');
  // eslint-disable-next-line react-hooks/exhaustive-deps -- rebuilt when the shape changes
  const tableColumns = useMemo(() => logColumns(live), [shape, canWrite]);
  const pages = data ? Math.max(1, Math.ceil(data.total / data.limit)) : 1;
  // A page left empty by deletions or narrower filters: show the last page that has rows.
  const pastEnd = data !== undefined && data.rows.length === 0 && data.total > 0;
  useEffect(() => {
    if (pastEnd) setFilter('page', String(pages));
  }, [pastEnd, pages, setFilter]);

  return (
    <article className="space-y-3">
      <h1 className="text-2xl font-semibold text-leaf-900">{heading}</h1>
      <RecordsNav slug={slug} />
      <FilterBar>
        <SiteFilter
          sites={trial.sites}
          value={filters.siteId ?? ''}
          onChange={(v) => setFilter('siteId', v)}
        />
        <FilterInput
          label="From"
          type="date"
          value={filters.from ?? ''}
          onChange={(v) => setFilter('from', v)}
        />
        <FilterInput
          label="To"
          type="date"
          value={filters.to ?? ''}
          onChange={(v) => setFilter('to', v)}
        />
        <FilterSelect
          label={kind.choice.label}
          value={String(filters[kind.choice.field] ?? '')}
          onChange={(v) => setFilter(kind.choice.field, v)}
        >
          <option value="">{kind.choice.all}</option>
          {kind.choice.options.map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </FilterSelect>
        <FilterInput label={kind.searchLabel} value={search} onChange={setSearch} />
      </FilterBar>
      {checked.success ? null : (
        <ul role="alert" className="font-medium text-frost-600">
          {checked.error.issues.map((issue) => (
            <li key={issue.path.join('.')}>{issue.message}</li>
          ))}
        </ul>
      )}
      {conflict && draft ? (
        <ConflictNotice
          conflict={conflict}
          onCancel={() => {
            setDraft(null);
            setConflict(null);
          }}
          onUseCurrent={() => {
            setDraft({
              ...draft,
              version: conflict.currentVersion,
              values: kind.fromStored(conflict.current, draft.values),
            });
            setConflict(null);
          }}
        />
      ) : null}
      {problem ? (
        <p role="alert" className="font-medium text-frost-600">
          {problem}
        </p>
      ) : null}
      {!checked.success ? null : list.isPending ? (
        <Spinner label={kind.loadingLabel} />
      ) : list.error || !data ? (
        <ErrorPanel error={list.error} />
      ) : (
        <>
          <ScrollRegion label={heading} className="rounded-lg bg-white shadow-sm">
            <DataTable
              showCaption
              caption={data.summary}
              className="min-w-[48rem]"
              busy={list.isFetching}
              data={data.rows}
              rowId={(row) => row.id}
              columns={tableColumns}
              sort={{
                state: sortingOf(filters),
                onChange: ([first]) => {
                  if (!first) return;
                  setDraft(null);
                  setSort(first.id, first.desc);
                },
              }}
            />
          </ScrollRegion>
          <Pager
            label={`Pages of the ${kind.title.toLowerCase()}`}
            answer={data}
            pages={pages}
            onPage={(page) => {
              setDraft(null);
              setFilter('page', String(page));
            }}
          />
        </>
      )}
      {deleted ? (
        <UndoToast
          message={`Deleted the ${kind.rowName(deleted)}.`}
          busy={undo.isPending}
          onClose={() => setDeleted(null)}
          onUndo={async () => {
            try {
              await undo.mutateAsync(deleted.id);
            } catch (err) {
              setProblem(err instanceof Error ? err.message : 'Could not undo.');
            }
            setDeleted(null);
          }}
        />
      ) : null}
    </article>
  );
}

type Draft<D> = { id: string; version: number; values: D };

/**
 * A two-factor trial's log shows each record's plot level of the treatment after the entry,
 * headed by the treatment's name (a one-factor trial's log is as it was).
 */
function withTreatment<R extends Stored, D>(
  columns: LogColumn<R, D>[],
  factorName: string | undefined,
): LogColumn<R, D>[] {
  if (!factorName) return columns;
  const at = columns.findIndex((c) => c.sort === 'entry') + 1;
  // A treatment named like another column ("Note") is headed "Treatment", so ids stay unique.
  const taken = columns.some((c) => c.header.toLowerCase() === factorName.trim().toLowerCase());
  const level: LogColumn<R, D> = {
    header: taken ? 'Treatment' : factorName.trim(),
    cell: (row) => row.treatment ?? '',
  };
  return [...columns.slice(0, at), level, ...columns.slice(at)];
}

/** What the log's cells read at render time (see `logColumns`). */
interface LiveLog<R, D> {
  columns: LogColumn<R, D>[];
  draft: Draft<D> | null;
  setDraft: (draft: Draft<D>) => void;
  actions: ((row: R, editing: boolean) => ReactNode) | null;
}

/**
 * The log's columns for the one table: a row being edited shows its inputs in place, and the
 * last column holds the row's buttons when the reader may change records. Headers come from
 * the columns as they are now; cells read `live` when they draw.
 */
function logColumns<R extends Stored, D>(live: { current: LiveLog<R, D> }): ColumnDef<R, any>[] {
  const col = createColumnHelper<R>();
  const editing = (row: R) => {
    const { draft } = live.current;
    return draft?.id === row.id ? draft : null;
  };
  const highlight = (row: R) => (editing(row) ? 'bg-straw-50' : '');
  return [
    ...live.current.columns.map((c, i) =>
      // The server sorts (across pages); the value is only what makes the header a sort button.
      col.accessor((row) => row.id, {
        id: c.sort ?? c.header,
        header: c.header,
        enableSorting: c.sort !== undefined,
        sortDescFirst: c.sort === 'date',
        cell: ({ row: { original: row } }) => {
          const now = live.current.columns[i] ?? c;
          const d = editing(row);
          return d && now.edit
            ? now.edit(d.values, (values) => live.current.setDraft({ ...d, values }), row)
            : now.cell(row);
        },
        meta: { align: c.align, cellClassName: highlight },
      }),
    ),
    ...(live.current.actions
      ? [
          col.display({
            id: 'change',
            header: 'Change',
            cell: ({ row: { original: row } }) => (
              <span className="flex gap-1">
                {live.current.actions?.(row, editing(row) !== null)}
              </span>
            ),
            meta: { cellClassName: highlight },
          }),
        ]
      : []),
  ];
}

/** Previous and next, and where this page stands: "Rows 51–100 of 2,158 · page 2 of 44". */
function Pager<R, D>({
  label,
  answer,
  pages,
  onPage,
}: {
  label: string;
  answer: LogAnswer<R, D>;
  pages: number;
  onPage: (page: number) => void;
}) {
  const first = answer.rows.length ? (answer.page - 1) * answer.limit + 1 : 0;
  const last = first ? first + answer.rows.length - 1 : 0;
  const button =
    'min-h-11 rounded-lg border border-leaf-300 bg-white px-3 font-semibold text-leaf-700 disabled:opacity-50';
  return (
    <nav aria-label={label} className="flex flex-wrap items-center gap-2">
      <button
        type="button"
        className={button}
        disabled={answer.page <= 1}
        onClick={() => onPage(answer.page - 1)}
      >
        Previous page
      </button>
      <p aria-live="polite" className="text-sm text-loam-700">
        Rows {first.toLocaleString('en')}–{last.toLocaleString('en')} of{' '}
        {answer.total.toLocaleString('en')} · page {answer.page} of {pages}
      </p>
      <button
        type="button"
        className={button}
        disabled={answer.page >= pages}
        onClick={() => onPage(answer.page + 1)}
      >
        Next page
      </button>
    </nav>
  );
}
