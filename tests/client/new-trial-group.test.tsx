/**
 * The new-trial page offers a group only to someone who coordinates more than one group, the
 * first chosen to begin with; otherwise the request leaves the group to the server's default.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, render, screen, waitFor } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';

const user = {
  id: '00000000-0000-4000-8000-0000000000c1',
  name: 'Tamsin Orrell',
  email: 'tamsin@orrell.example',
  emailVerified: true,
  unitSystem: 'metric',
  isAdmin: false,
};
const group = (n: number, myRole: 'coordinator' | 'member') => ({
  id: `00000000-0000-4000-8000-00000000000${n}`,
  slug: `orrell-${n}`,
  name: `Orrell plot ${n}`,
  myRole,
});
const json = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

let groups: ReturnType<typeof group>[] = [];
let sent: Record<string, unknown> | null = null;
let NewTrial: typeof import('../../src/features/design/routes/new-trial-route').Component;
beforeAll(async () => {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
      const url = typeof input === 'string' ? input : input instanceof URL ? input.href : input.url;
      if (url.endsWith('/api/session')) return json(200, { user });
      if (url.endsWith('/api/groups')) return json(200, { groups });
      if (url.endsWith('/api/trials') && init?.method === 'POST') {
        sent = JSON.parse(String(init.body));
        return json(201, { id: '00000000-0000-4000-8000-0000000000d1', slug: 'orrell-okra' });
      }
      return json(404, { error: { code: 'not_found', message: 'Not here.' } });
    }),
  );
  NewTrial = (await import('../../src/features/design/routes/new-trial-route')).Component;
});
afterEach(() => {
  sent = null;
});

async function createTrial() {
  const router = createMemoryRouter(
    [
      { path: '/new', element: <NewTrial /> },
      { path: '/t/:slug/entries', element: <h1>Entries</h1> },
    ],
    { initialEntries: ['/new'] },
  );
  render(
    <QueryClientProvider
      client={new QueryClient({ defaultOptions: { queries: { retry: false } } })}
    >
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  fireEvent.change(await screen.findByLabelText(/^Title/), { target: { value: 'Orrell okra' } });
  fireEvent.change(screen.getByLabelText(/^Crop/), { target: { value: 'Okra' } });
  fireEvent.change(screen.getByLabelText(/^Season/), { target: { value: '2027' } });
}

describe('the group on the new-trial page', () => {
  it('offers the coordinated groups, the first chosen, and sends the one picked', async () => {
    groups = [group(1, 'coordinator'), group(2, 'member'), group(3, 'coordinator')];
    await createTrial();
    const picker = await screen.findByLabelText(/^Group/);
    expect([...(picker as HTMLSelectElement).options].map((o) => o.text)).toEqual([
      'Orrell plot 1',
      'Orrell plot 3',
    ]);
    await waitFor(() => expect((picker as HTMLSelectElement).value).toBe(group(1, 'member').id));
    fireEvent.change(picker, { target: { value: group(3, 'coordinator').id } });
    fireEvent.click(screen.getByRole('button', { name: 'Create trial' }));
    await screen.findByRole('heading', { name: 'Entries' });
    expect(sent).toMatchObject({ title: 'Orrell okra', groupId: group(3, 'coordinator').id });
  });

  it('shows no picker to someone coordinating one group, and leaves the group to the server', async () => {
    groups = [group(1, 'coordinator'), group(2, 'member')];
    await createTrial();
    await waitFor(() =>
      expect(fetch).toHaveBeenCalledWith(
        expect.stringMatching(/\/api\/groups$/),
        expect.anything(),
      ),
    );
    expect(screen.queryByLabelText(/^Group/)).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Create trial' }));
    await screen.findByRole('heading', { name: 'Entries' });
    expect(sent).not.toHaveProperty('groupId');
  });
});
