import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ApiError } from '@/lib/api-client';
import { useDeleteTrial } from '../api/delete-trial';

/** Deleting is permanent: the lead types the trial's address to confirm. */
export function DeleteTrialSection({ slug }: { slug: string }) {
  const [typed, setTyped] = useState('');
  const remove = useDeleteTrial(slug);
  const navigate = useNavigate();
  const error =
    remove.error instanceof ApiError
      ? remove.error.message
      : remove.error
        ? 'The trial could not be deleted.'
        : null;
  return (
    <section
      aria-labelledby="delete-heading"
      className="mt-8 rounded-lg border-2 border-frost-600/50 bg-white p-4"
    >
      <h2 id="delete-heading" className="text-lg font-semibold text-frost-600">
        Delete this trial
      </h2>
      <p className="mt-1 text-sm">
        This removes every entry, plot, harvest, measurement, field event, photo and published
        results version of the trial, for everyone. It cannot be undone. Download what you want to
        keep first (Records → export).
      </p>
      <form
        className="mt-3 flex flex-col gap-2 sm:flex-row sm:items-end"
        onSubmit={(e) => {
          e.preventDefault();
          remove.mutate(typed, { onSuccess: () => navigate('/', { replace: true }) });
        }}
      >
        <label className="flex flex-1 flex-col text-sm font-medium">
          Type the trial address <code className="font-mono">{slug}</code> to confirm
          <input
            className="mt-1 min-h-11 rounded-lg border border-leaf-300 px-3 font-mono"
            value={typed}
            autoComplete="off"
            onChange={(e) => setTyped(e.target.value)}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? 'delete-error' : undefined}
          />
        </label>
        <Button type="submit" variant="danger" disabled={typed !== slug || remove.isPending}>
          {remove.isPending ? 'Deleting…' : 'Delete the trial'}
        </Button>
      </form>
      {error ? (
        <p id="delete-error" role="alert" className="mt-2 text-sm text-frost-600">
          {error}
        </p>
      ) : null}
    </section>
  );
}
