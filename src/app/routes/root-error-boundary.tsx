import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';

export function RootErrorBoundary() {
  const error = useRouteError();
  const message = isRouteErrorResponse(error)
    ? `${error.status} ${error.statusText}`
    : error instanceof Error
      ? error.message
      : 'Unknown error';
  return (
    <main className="mx-auto max-w-2xl p-6">
      <h1 className="text-2xl font-semibold text-frost-600">Something went wrong</h1>
      <p className="mt-3">
        Rowtally hit a problem showing this page. Your saved records are not affected.
      </p>
      <pre className="mt-4 overflow-x-auto rounded bg-white p-3 text-sm">{message}</pre>
      <Link to="/" className="mt-6 inline-block font-semibold text-leaf-700 underline">
        Back to the start
      </Link>
    </main>
  );
}
