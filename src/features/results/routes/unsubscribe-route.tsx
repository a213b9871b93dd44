import { useMutation } from '@tanstack/react-query';
import { useEffect } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { unsubscribe } from '../api/follow-results';

/** Opening the link is the one click: the page unsubscribes as it loads. */
export function Component() {
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const { mutate, data, error, isIdle, isPending } = useMutation({
    mutationFn: () => unsubscribe(token),
  });
  useEffect(() => {
    mutate();
  }, [mutate]);
  if (isIdle || isPending) return <Spinner label="Unsubscribing…" />;
  if (error) return <ErrorPanel error={error} title="We could not unsubscribe this address" />;
  return (
    <section className="mx-auto max-w-prose py-8">
      <h1 className="text-2xl font-semibold text-leaf-900">Unsubscribed</h1>
      <p className="mt-3">
        {data.email} will get no more messages about “{data.title}”.
      </p>
      <Link
        to={`/r/${data.slug}`}
        className="mt-4 inline-block font-semibold text-leaf-700 underline"
      >
        See the results
      </Link>
    </section>
  );
}
