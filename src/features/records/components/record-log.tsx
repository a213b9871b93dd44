/** The record pages' filter controls, and the buttons of a log row. */
import type { ReactNode } from 'react';

/** The input style of a cell being edited in place. */
export const editCell = 'min-h-11 w-full rounded border border-leaf-300 bg-white px-2';

/**
 * The typed-in cell of a row being edited, for one text field of the draft: `editText('note',
 * 'Note')` gives a column's `edit`.
 */
export function editText<D>(
  field: { [K in keyof D]: D[K] extends string ? K : never }[keyof D],
  label: string | ((draft: D) => string),
  input: { type?: (draft: D) => 'date' | 'text'; inputMode?: 'numeric' | 'decimal' } = {},
) {
  function EditCell(draft: D, change: (next: D) => void) {
    const type = input.type?.(draft) ?? 'text';
    return (
      <input
        aria-label={typeof label === 'string' ? label : label(draft)}
        type={type}
        inputMode={type === 'date' ? undefined : input.inputMode}
        value={draft[field] as string}
        onChange={(e) => change({ ...draft, [field]: e.target.value })}
        className={editCell}
      />
    );
  }
  return EditCell;
}
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
