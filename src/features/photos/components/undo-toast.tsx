import { useEffect } from 'react';
import { Button } from '@/components/ui/button';

/** "Photo deleted — Undo", for a few seconds; the server keeps the photo for a day anyway. */
export function UndoToast({
  message,
  onUndo,
  onDismiss,
  busy,
}: {
  message: string;
  onUndo: () => void;
  onDismiss: () => void;
  busy?: boolean;
}) {
  useEffect(() => {
    const timer = setTimeout(onDismiss, 12_000);
    return () => clearTimeout(timer);
  }, [onDismiss]);
  return (
    <div
      role="status"
      className="fixed inset-x-2 bottom-2 z-[60] mx-auto flex max-w-md items-center justify-between gap-2 rounded-lg bg-leaf-900 p-2 pl-4 text-white shadow-lg"
    >
      <span>{message}</span>
      <span className="flex gap-1">
        <Button variant="secondary" onClick={onUndo} disabled={busy}>
          Undo
        </Button>
        <Button variant="ghost" className="text-white hover:bg-leaf-700" onClick={onDismiss}>
          Dismiss
        </Button>
      </span>
    </div>
  );
}
