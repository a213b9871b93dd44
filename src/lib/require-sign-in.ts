import type { QueryClient } from '@tanstack/react-query';
import { type LoaderFunctionArgs, redirect } from 'react-router-dom';
import { meQueryOptions } from './session';

/**
 * Loader for pages that need a signed-in user: a signed-out visitor is sent to sign in, and
 * back here afterwards (`?next=`). The server checks every request anyway; this only saves a
 * page of errors.
 */
export function requireSignIn(queryClient: QueryClient) {
  return async ({ request }: LoaderFunctionArgs) => {
    const me = await queryClient.ensureQueryData(meQueryOptions());
    if (!me) {
      const url = new URL(request.url);
      throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search + url.hash)}`);
    }
    return null;
  };
}
