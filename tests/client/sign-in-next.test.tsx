/**
 * After signing in, the page named in `?next=` opens, in a browser router on jsdom's history.
 * A tab or newline in `next` must not turn it into another site's address (browsers drop
 * them: WHATWG URL Standard, basic URL parser), nor leave the signed-in user on the sign-in
 * page with a page error.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, render, screen, waitFor } from '@testing-library/react';
import { createBrowserRouter, RouterProvider } from 'react-router-dom';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';

const user = {
  id: '00000000-0000-4000-8000-0000000000b1',
  name: 'Wren Alderby',
  email: 'wren@larkhaven.example',
  emailVerified: true,
  unitSystem: 'metric',
  isAdmin: false,
};
const json = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

let signedIn = false;
let SignIn: typeof import('../../src/features/auth/routes/sign-in-route').Component;
// The sign-in library's client keeps the fetch it finds when it loads: stub it first.
beforeAll(async () => {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: RequestInfo | URL) => {
      const url = typeof input === 'string' ? input : input instanceof URL ? input.href : input.url;
      if (url.endsWith('/api/auth/sign-in/email')) {
        signedIn = true;
        return json(200, { redirect: false, token: 'x', user });
      }
      if (url.endsWith('/api/session')) return json(200, { user: signedIn ? user : null });
      return json(404, { error: { code: 'not_found', message: 'Not here.' } });
    }),
  );
  SignIn = (await import('../../src/features/auth/routes/sign-in-route')).Component;
});
afterEach(() => {
  signedIn = false;
  window.history.replaceState(null, '', '/');
});

async function signInWith(next: string) {
  window.history.replaceState(null, '', `/sign-in?next=${encodeURIComponent(next)}`);
  const router = createBrowserRouter([
    { path: '/sign-in', element: <SignIn /> },
    { path: '/', element: <h1>Your trials</h1> },
    { path: '/t/:slug', element: <h1>Trial page</h1> },
  ]);
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  fireEvent.change(screen.getByLabelText(/E-mail/), { target: { value: user.email } });
  fireEvent.change(screen.getByLabelText(/^Password/), {
    target: { value: 'pods-and-petals-2026' },
  });
  fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
  return router;
}

describe('the page after sign-in', () => {
  it('opens the local page that `next` names', async () => {
    await signInWith('/t/larkhaven-okra-2026');
    await screen.findByRole('heading', { name: 'Trial page' });
    expect(window.location.pathname).toBe('/t/larkhaven-okra-2026');
  });

  for (const [label, next] of [
    ['a tab', '/\t/elsewhere.example/'],
    ['a newline', '/\n/elsewhere.example/'],
    ['a carriage return and newline', '/\r\n/elsewhere.example/'],
  ] as const)
    it(`opens the home page when \`next\` hides another site behind ${label}`, async () => {
      await signInWith(next);
      await screen.findByRole('heading', { name: 'Your trials' });
      await waitFor(() => expect(window.location.pathname).toBe('/'));
      expect(window.location.host).toBe('localhost:3000');
    });
});
