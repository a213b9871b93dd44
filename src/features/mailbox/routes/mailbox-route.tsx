import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { ApiError } from '@/lib/api-client';
import { useMailbox } from '../api/get-mailbox';

/** Development only: every message the local capture server received, with its links. */
export function Component() {
  const { data, error, isPending, refetch, isFetching } = useMailbox();
  if (isPending) return <Spinner label="Opening the mailbox…" />;
  if (error) {
    if (error instanceof ApiError && error.status === 404)
      return (
        <section className="py-6">
          <h1 className="text-2xl font-semibold text-leaf-900">Development mailbox</h1>
          <p className="mt-2">There is no local mailbox here: this server sends real mail.</p>
        </section>
      );
    return <ErrorPanel error={error} />;
  }
  return (
    <section aria-labelledby="mailbox-heading" className="flex flex-col gap-4">
      <header className="flex flex-wrap items-center justify-between gap-2">
        <div>
          <h1 id="mailbox-heading" className="text-3xl font-semibold text-leaf-900">
            Development mailbox
          </h1>
          <p className="text-loam-700">
            Mail this server sent, newest first. Nothing here leaves this computer.
          </p>
        </div>
        <Button variant="secondary" onClick={() => void refetch()} disabled={isFetching}>
          {isFetching ? 'Checking…' : 'Check for new mail'}
        </Button>
      </header>
      {data.messages.length === 0 ? (
        <p>No mail yet.</p>
      ) : (
        <ol className="flex flex-col gap-3">
          {data.messages.map((m) => (
            <li key={m.id}>
              <article aria-label={m.subject} className="rounded-lg bg-white p-3 shadow-sm">
                <h2 className="font-sans text-lg font-semibold">{m.subject}</h2>
                <p className="text-sm text-loam-700 break-all">
                  To {m.to.join(', ')} · {new Date(m.receivedAt).toLocaleString()}
                </p>
                <pre className="mt-2 whitespace-pre-wrap break-words font-sans text-sm">
                  {m.text}
                </pre>
                {m.links.length ? (
                  <ul className="mt-2 flex flex-col gap-1">
                    {m.links.map((l) => (
                      <li key={l}>
                        <a href={l} className="break-all font-semibold text-leaf-700 underline">
                          {l}
                        </a>
                      </li>
                    ))}
                  </ul>
                ) : null}
              </article>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
