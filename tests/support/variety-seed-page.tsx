/**
 * Brook Runner's seed page drawn at its own address for client tests, with no one signed in and
 * no retries; the test stubs `fetch` with the server's answers first.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render } from '@testing-library/react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { Component as VarietySeedPage } from '../../src/features/seed/routes/variety-seed-route';
import { sessionKeys } from '../../src/lib/session';

export function renderBrookRunnerSeedPage() {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  client.setQueryData(sessionKeys.me, null);
  return render(
    <QueryClientProvider client={client}>
      <MemoryRouter initialEntries={['/varieties/brook-runner/seed']}>
        <Routes>
          <Route path="/varieties/:slug/seed" element={<VarietySeedPage />} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
}
