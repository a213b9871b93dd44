import type { ConflictDetails } from '@common/contracts/records';

const fieldNames: Record<string, string> = {
  harvestedOn: 'date',
  fruitCount: 'fruit count',
  massG: 'mass (g)',
  grade: 'grade',
  note: 'note',
  observedOn: 'date',
  value: 'value',
  valueDate: 'date value',
  plantNumber: 'plant number',
  deletedAt: 'deleted',
};

/** A stale save: who won, what changed, and what is stored now. */
export function ConflictNotice({
  conflict,
  onUseCurrent,
  onCancel,
}: {
  conflict: ConflictDetails;
  onUseCurrent: () => void;
  onCancel: () => void;
}) {
  const names = conflict.changedFields.map((f) => fieldNames[f] ?? f);
  return (
    <div role="alert" className="rounded-lg border-2 border-frost-600 bg-white p-3 text-sm">
      <p className="font-semibold text-frost-600">
        Not saved: someone else changed this record while you were editing it.
      </p>
      <p className="mt-1">
        Changed since you opened it: <strong>{names.join(', ') || 'nothing visible'}</strong>{' '}
        (version {conflict.yourVersion} → {conflict.currentVersion}).
      </p>
      <ul className="mt-1 list-disc pl-5">
        {conflict.changedFields.map((f) => (
          <li key={f}>
            {fieldNames[f] ?? f} is now <strong>{String(conflict.current[f] ?? '—')}</strong>
          </li>
        ))}
      </ul>
      <div className="mt-2 flex flex-wrap gap-2">
        <button
          type="button"
          onClick={onUseCurrent}
          className="min-h-11 rounded-lg bg-leaf-700 px-3 font-semibold text-white"
        >
          Edit again from the stored values
        </button>
        <button
          type="button"
          onClick={onCancel}
          className="min-h-11 rounded-lg border border-leaf-700 px-3 font-semibold text-leaf-700"
        >
          Keep the stored values
        </button>
      </div>
    </div>
  );
}
