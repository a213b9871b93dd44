import { useQuery } from '@tanstack/react-query';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { confirmFollow } from '../api/follow-results';

export function Component() {
  const { slug = '' } = useParams();
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const { data, error, isPending } = useQuery({
    queryKey: ['results', 'confirm-follow', token],
    queryFn: () => confirmFollow(token),
    retry: false,
    staleTime: Infinity,
  });
  if (isPending) return <Spinner label="Confirming…" />;
  if (error) return <ErrorPanel error={error} title="The confirmation did not work" />;
  return (
    <section className="mx-auto max-w-prose py-8">
      <h1 className="text-2xl font-semibold text-leaf-900">You are following these results</h1>
      <p className="mt-3">
        We will write to {data.email} when a new version of “{data.title}” is published.
      </p>
      <Link to={`/r/${slug}`} className="mt-4 inline-block font-semibold text-leaf-700 underline">
        Back to the results
      </Link>
    </section>
  );
}
