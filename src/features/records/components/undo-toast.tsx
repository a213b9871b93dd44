/** "Deleted — Undo" after a deletion; undo lasts as long as the server allows (15 minutes). */
export function UndoToast({
  message,
  onUndo,
  onClose,
  busy,
}: {
  message: string;
  onUndo: () => void;
  onClose: () => void;
  busy: boolean;
}) {
  return (
    <div
      role="status"
      className="fixed inset-x-2 bottom-2 z-30 mx-auto flex max-w-md items-center gap-2 rounded-lg bg-ink p-3 text-white shadow-lg"
    >
      <span className="flex-1">{message}</span>
      <button
        type="button"
        disabled={busy}
        onClick={onUndo}
        className="min-h-11 rounded-lg bg-pod-500 px-3 font-semibold text-ink"
      >
        Undo
      </button>
      <button
        type="button"
        onClick={onClose}
        aria-label="Close"
        className="min-h-11 min-w-11 rounded-lg"
      >
        ✕
      </button>
    </div>
  );
}
