import { ApiError } from '@/lib/api-client';

export function ErrorPanel({
  error,
  title = 'This could not be loaded',
}: {
  error: unknown;
  title?: string;
}) {
  const message = error instanceof Error ? error.message : 'Something went wrong.';
  return (
    <div role="alert" className="rounded-lg border border-frost-600/40 bg-white p-4">
      <p className="font-semibold text-frost-600">{title}</p>
      <p className="mt-1 text-ink">{message}</p>
      {error instanceof ApiError && error.status === 0 ? (
        <p className="mt-1 text-sm text-loam-700">
          Records you enter while offline are kept on this device.
        </p>
      ) : null}
    </div>
  );
}
