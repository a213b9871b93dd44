/**
 * Text alternatives of a variety's cover photo (WCAG 2.2 success criterion 1.1.1 Non-text
 * Content; the W3C WAI images tutorial: an image beside text that says the same is decorative,
 * `alt=""`, and an informative image's alternative says what it shows). The register's thumbnail
 * sits beside the variety's linked name, so it is not read out; the variety page's cover says
 * what its caption says, and only without a caption falls back to the variety's name.
 */
import type { VarietyList, VarietyRecord } from '@common/contracts/varieties';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen } from '@testing-library/react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { Component as RegisterPage } from '../../src/features/varieties/routes/register-route';
import { Component as VarietyPage } from '../../src/features/varieties/routes/variety-route';
import { sessionKeys } from '../../src/lib/session';
import { trialKeys } from '../../src/lib/trial-keys';
import { brookRunner, fixtureGroupId } from '../support/variety-fixtures';

const cover = {
  id: '00000000-0000-4000-8000-0000000000f1',
  thumbUrl: '/api/trials/fenwold-beans-2026/photos/f1/thumb',
  displayUrl: '/api/trials/fenwold-beans-2026/photos/f1/display',
};

// Nothing here needs the server: every query the pages read is already answered.
beforeEach(() =>
  vi.stubGlobal(
    'fetch',
    vi.fn(() => new Promise<Response>(() => {})),
  ),
);
afterEach(() => vi.unstubAllGlobals());

function show(
  path: string,
  route: string,
  page: React.ReactNode,
  answers: [readonly unknown[], unknown][],
) {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  client.setQueryData(sessionKeys.me, null);
  client.setQueryData(trialKeys.groups(), { groups: [] });
  for (const [key, data] of answers) client.setQueryData(key, data);
  return render(
    <QueryClientProvider client={client}>
      <MemoryRouter initialEntries={[path]}>
        <Routes>
          <Route path={route} element={page} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
}

const record = (caption: string): VarietyRecord => ({
  variety: brookRunner(cover),
  canEdit: false,
  trials: [],
  photos: [{ ...cover, caption, trialSlug: 'fenwold-beans-2026', season: '2026' }],
});

describe('a variety’s cover photo', () => {
  it('in the register, beside the variety’s name, is left out of what is read', async () => {
    const list: VarietyList = {
      varieties: [
        {
          id: '00000000-0000-4000-8000-0000000000a1',
          slug: 'brook-runner',
          name: 'Brook Runner',
          crop: 'Pole bean',
          type: 'heirloom',
          aliases: [],
          groupId: fixtureGroupId,
          trialCount: 1,
          seasonCount: 1,
          cover,
        },
      ],
    };
    const { container } = show('/varieties', '/varieties', <RegisterPage />, [
      [trialKeys.varieties(), list],
    ]);
    const link = await screen.findByRole('link', { name: 'Brook Runner' });
    const thumb = container.querySelector(`img[src="${cover.thumbUrl}"]`)!;
    expect(thumb.getAttribute('alt')).toBe('');
    // Decorative: no image role, so the row's cell reads "Brook Runner" once.
    expect(screen.queryAllByRole('img')).toEqual([]);
    expect(link.closest('td, th')!.textContent).toBe('Brook Runner');
  });

  it('on the variety’s page, says what its caption says', async () => {
    show('/varieties/brook-runner', '/varieties/:variety', <VarietyPage />, [
      [
        trialKeys.variety('brook-runner'),
        record('Brook Runner pods at first picking, Hollin Yard'),
      ],
    ]);
    await screen.findByRole('heading', { level: 1, name: 'Brook Runner' });
    const shown = screen.getAllByRole('img', {
      name: 'Brook Runner pods at first picking, Hollin Yard',
    });
    expect(shown.map((img) => img.getAttribute('src'))).toContain(cover.displayUrl);
  });

  it('without a caption, falls back to the variety’s name', async () => {
    show('/varieties/brook-runner', '/varieties/:variety', <VarietyPage />, [
      [trialKeys.variety('brook-runner'), record('')],
    ]);
    await screen.findByRole('heading', { level: 1, name: 'Brook Runner' });
    expect(screen.getByRole('img', { name: 'Brook Runner, cover photo' }).getAttribute('src')).toBe(
      cover.displayUrl,
    );
  });
});
