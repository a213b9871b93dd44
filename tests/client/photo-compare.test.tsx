/**
 * Side by side opens on the latest week that has photos when no week is asked for, not on
 * today's (often empty) week. Weeks are ISO 8601 weeks, Monday to Sunday: 2026-07-15 is a
 * Wednesday, so its week runs from Monday 2026-07-13 to Sunday 2026-07-19.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen } from '@testing-library/react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { Component as PhotoCompare } from '../../src/features/photos/routes/photo-compare-route';

const tagging = {
  entries: [],
  plots: [],
  permissions: { upload: false, chooseCover: false },
  limits: { maxBytes: 1, maxFiles: 1, maxPixels: 1, acceptedTypes: [], heicReadable: false },
};
const photo = (id: string, takenOn: string | null) => ({
  id,
  entryId: null,
  plotId: null,
  takenOn,
  capturedAt: null,
  caption: '',
  subject: null,
  mimeType: 'image/jpeg',
  width: null,
  height: null,
  bytes: null,
  thumbWidth: null,
  thumbHeight: null,
  displayWidth: null,
  displayHeight: null,
  isCover: false,
  uploadedBy: null,
  createdAt: '2026-07-20T08:00:00.000Z',
  deletedAt: null,
  canEdit: false,
  urls: { thumb: '/t', display: '/d', original: null },
});
const json = (body: unknown) =>
  new Response(JSON.stringify(body), {
    status: 200,
    headers: { 'Content-Type': 'application/json' },
  });

afterEach(() => vi.unstubAllGlobals());

function renderAt(url: string) {
  const asked: string[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (u: string) => {
      asked.push(u);
      if (u.endsWith('/photos/tagging')) return json(tagging);
      // Newest first, as the server lists them; one photo without a date.
      return json({
        photos: [
          photo('00000000-0000-4000-8000-0000000000b1', null),
          photo('00000000-0000-4000-8000-0000000000b2', '2026-07-15'),
          photo('00000000-0000-4000-8000-0000000000b3', '2026-06-02'),
        ],
      });
    }),
  );
  render(
    <QueryClientProvider
      client={new QueryClient({ defaultOptions: { queries: { retry: false } } })}
    >
      <MemoryRouter initialEntries={[url]}>
        <Routes>
          <Route path="/t/:slug/photos/compare" element={<PhotoCompare />} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
  return asked;
}

describe('side by side photos', () => {
  it('opens on the latest week with photos', async () => {
    const asked = renderAt('/t/brookfold/photos/compare');
    await screen.findByText('2026-07-13 to 2026-07-19');
    expect(asked.some((u) => u.includes('from=2026-07-13') && u.includes('to=2026-07-19'))).toBe(
      true,
    );
  });

  it('keeps the week asked for in the address', async () => {
    renderAt('/t/brookfold/photos/compare?week=2026-06-03');
    await screen.findByText('2026-06-01 to 2026-06-07');
  });
});
