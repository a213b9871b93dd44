import type { FormEvent, ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/text-field';

/** The add-or-edit form of an entry or site; a new key per record resets its fields. */
export function PartForm({
  editingId,
  title,
  onSubmit,
  children,
}: {
  editingId: string | null;
  title: string;
  onSubmit: (e: FormEvent<HTMLFormElement>) => void;
  children: ReactNode;
}) {
  return (
    <form
      key={editingId ?? 'new'}
      onSubmit={onSubmit}
      noValidate
      aria-label={title}
      className="space-y-3 rounded-xl bg-white p-4 shadow-sm"
    >
      <h2 className="text-xl font-semibold text-leaf-900">{title}</h2>
      {children}
    </form>
  );
}

/** A refusal not tied to one field, then submit, and Cancel while editing. */
export function PartFormActions({
  refusal,
  pending,
  submitLabel,
  onCancel,
}: {
  refusal: string | undefined;
  pending: boolean;
  submitLabel: string;
  onCancel?: () => void;
}) {
  return (
    <>
      {refusal ? <FormMessage tone="error">{refusal}</FormMessage> : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={pending}>
          {pending ? 'Saving…' : submitLabel}
        </Button>
        {onCancel ? (
          <Button type="button" variant="ghost" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </>
  );
}

/** Edit and Remove for a listed part; removing waits until the layout is cleared. */
export function PartActions({
  name,
  onEdit,
  layoutExists,
  removing,
  confirmMessage,
  onRemove,
}: {
  name: string;
  onEdit: () => void;
  layoutExists: boolean;
  removing: boolean;
  confirmMessage: string;
  onRemove: () => void;
}) {
  return (
    <div className="mt-2 flex gap-2">
      <Button variant="secondary" onClick={onEdit} aria-label={`Edit ${name}`}>
        Edit
      </Button>
      <Button
        variant="ghost"
        disabled={layoutExists || removing}
        title={layoutExists ? 'Clear the layout first' : undefined}
        aria-label={`Remove ${name}`}
        onClick={() => {
          if (window.confirm(confirmMessage)) onRemove();
        }}
      >
        Remove
      </Button>
    </div>
  );
}
