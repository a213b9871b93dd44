/**
 * The harvest log in a browser-like page: inline edit sends the version it read; a 409 is
 * shown with the fields that changed and the stored values, and nothing is overwritten. The
 * log asks the server for one page at a time with the filters chosen, and checks them first.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { act, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { Profiler } from 'react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { Component as HarvestLog } from '../../src/features/records/routes/harvest-log-route';
import { brookfoldTrial, jsonResponse as json, recordRowBase } from '../support/record-log-fixture';

const trial = brookfoldTrial({ harvestCount: 1 });
const harvest = {
  ...recordRowBase,
  id: '00000000-0000-4000-8000-0000000000a1',
  plotNumber: 101,
  harvestedOn: '2026-07-01',
  fruitCount: 10,
  massG: 120,
  grade: 'marketable',
};

afterEach(() => vi.unstubAllGlobals());

describe('the harvest log', () => {
  it('shows a stale save as a 409 with what changed, and renders a bounded number of times', async () => {
    const patches: unknown[] = [];
    vi.stubGlobal(
      'fetch',
      vi.fn(async (url: string, init?: RequestInit) => {
        if (url === '/api/me')
          return json(401, { error: { code: 'unauthenticated', message: 'Sign in.' } });
        if (url === '/api/trials/brookfold') return json(200, trial);
        if (
          url.startsWith('/api/trials/brookfold/harvests?') ||
          url === '/api/trials/brookfold/harvests'
        )
          return json(200, { harvests: [harvest], page: 1, limit: 50, total: 1, totalMassG: 120 });
        if (init?.method === 'PATCH') {
          patches.push(JSON.parse(String(init.body)));
          return json(409, {
            error: {
              code: 'conflict',
              message: 'Someone else changed this record since you opened it.',
              details: {
                current: { ...harvest, massG: 999, version: 2 },
                changedFields: ['massG'],
                yourVersion: 1,
                currentVersion: 2,
              },
            },
          });
        }
        return json(404, { error: { code: 'not_found', message: url } });
      }),
    );
    let commits = 0;
    const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false } } });
    render(
      <QueryClientProvider client={queryClient}>
        <MemoryRouter initialEntries={['/t/brookfold/records/harvests']}>
          <Profiler id="log" onRender={() => (commits += 1)}>
            <Routes>
              <Route path="/t/:slug/records/harvests" element={<HarvestLog />} />
            </Routes>
          </Profiler>
        </MemoryRouter>
      </QueryClientProvider>,
    );
    fireEvent.click(
      await screen.findByRole('button', { name: 'Edit harvest of plot 101 on 2026-07-01' }),
    );
    // Once the form is open and nothing is loading, the page is at rest: letting React run
    // every pending effect and update must not set off more renders (no loop between the
    // form and the data it was filled from).
    await screen.findByLabelText('Fruit count');
    await waitFor(() => expect(queryClient.isFetching()).toBe(0));
    await act(async () => {});
    const afterEdit = commits;
    await act(async () => {});
    await act(async () => {});
    expect(commits - afterEdit).toBeLessThan(3);
    // Typing keeps the same input (and so the caret and focus): the table must not remount it.
    const input = screen.getByLabelText('Fruit count');
    input.focus();
    fireEvent.change(input, { target: { value: '1' } });
    expect(screen.getByLabelText('Fruit count')).toBe(input);
    expect(document.activeElement).toBe(input);
    fireEvent.change(input, { target: { value: '11' } });
    expect(screen.getByLabelText('Fruit count')).toBe(input);
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    const alert = await screen.findByText(/Not saved: someone else changed this record/);
    expect(alert).toBeTruthy();
    expect(patches).toEqual([
      {
        version: 1,
        harvestedOn: '2026-07-01',
        fruitCount: 11,
        massG: 120,
        grade: 'marketable',
        note: '',
      },
    ]);
    await waitFor(() => expect(screen.getByText(/mass \(g\) is now/)).toBeTruthy());
    expect(screen.getByText('999')).toBeTruthy();
  });
});

describe('the harvest log, a page at a time', () => {
  it('asks for the next page, the order and the filters chosen, and refuses a reversed date range without asking', async () => {
    const asked: URL[] = [];
    vi.stubGlobal(
      'fetch',
      vi.fn(async (url: string) => {
        if (url === '/api/me')
          return json(401, { error: { code: 'unauthenticated', message: 'Sign in.' } });
        if (url === '/api/trials/brookfold') return json(200, trial);
        if (url.startsWith('/api/trials/brookfold/harvests')) {
          const u = new URL(url, 'http://local');
          asked.push(u);
          const page = Number(u.searchParams.get('page'));
          const rows = Array.from({ length: page < 3 ? 50 : 20 }, (_, i) => ({
            ...harvest,
            id: `00000000-0000-4000-8000-${String(page * 1000 + i).padStart(12, '0')}`,
            plotNumber: 100 + i,
          }));
          return json(200, { harvests: rows, page, limit: 50, total: 120, totalMassG: 14_400 });
        }
        return json(404, { error: { code: 'not_found', message: url } });
      }),
    );
    const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false } } });
    render(
      <QueryClientProvider client={queryClient}>
        <MemoryRouter initialEntries={['/t/brookfold/records/harvests']}>
          <Routes>
            <Route path="/t/:slug/records/harvests" element={<HarvestLog />} />
          </Routes>
        </MemoryRouter>
      </QueryClientProvider>,
    );
    await screen.findByText('Rows 1–50 of 120 · page 1 of 3');
    // The mass in total is over every page (the server sums it), not this page's 6 kg.
    expect(screen.getByText(/^120 harvests · 14,400 g in total/)).toBeTruthy();
    // One page of rows on screen: 50 rows, two buttons each.
    expect(screen.getAllByRole('button', { name: /^Edit harvest/ })).toHaveLength(50);
    expect(asked.at(-1)!.searchParams.get('page')).toBe('1');
    expect(asked.at(-1)!.searchParams.get('limit')).toBe('50');

    fireEvent.click(screen.getByRole('button', { name: 'Next page' }));
    await screen.findByText('Rows 51–100 of 120 · page 2 of 3');
    fireEvent.click(screen.getByRole('button', { name: 'Next page' }));
    await screen.findByText('Rows 101–120 of 120 · page 3 of 3');
    expect((screen.getByRole('button', { name: 'Next page' }) as HTMLButtonElement).disabled).toBe(
      true,
    );

    // A sort goes to the server (it sorts every page, not this one) and starts from the first
    // page; the headers say the order, newest first until asked otherwise.
    const header = (name: string) => screen.getByRole('columnheader', { name });
    expect(header('Date').getAttribute('aria-sort')).toBe('descending');
    fireEvent.click(screen.getByRole('button', { name: /^Plot/ }));
    await waitFor(() => expect(asked.at(-1)!.searchParams.get('sort')).toBe('plot'));
    expect(asked.at(-1)!.searchParams.get('order')).toBe('asc');
    expect(asked.at(-1)!.searchParams.get('page')).toBe('1');
    await screen.findByText('Rows 1–50 of 120 · page 1 of 3');
    expect(header('Plot').getAttribute('aria-sort')).toBe('ascending');
    expect(header('Date').getAttribute('aria-sort')).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: /^Plot/ }));
    await waitFor(() => expect(asked.at(-1)!.searchParams.get('order')).toBe('desc'));
    await waitFor(() => expect(header('Plot').getAttribute('aria-sort')).toBe('descending'));
    // The rows stay in the server's order (this fake server does not sort: plot 100 first).
    const firstRow = within(screen.getByRole('table')).getAllByRole('row')[1]!;
    expect(within(firstRow).getAllByRole('cell')[2]!.textContent).toBe('100');
    // Columns the server does not sort by have no sort button.
    expect(screen.queryByRole('button', { name: /^Mass/ })).toBeNull();

    // A filter starts its list from the first page and goes to the server.
    fireEvent.change(screen.getByLabelText('Site'), { target: { value: trial.sites[0]!.id } });
    fireEvent.change(screen.getByLabelText('Grade'), { target: { value: 'cull' } });
    await waitFor(() => expect(asked.at(-1)!.searchParams.get('grade')).toBe('cull'));
    expect(asked.at(-1)!.searchParams.get('siteId')).toBe(trial.sites[0]!.id);
    expect(asked.at(-1)!.searchParams.get('page')).toBe('1');

    // The contract's own message, and no request for a range that ends before it starts.
    const before = asked.length;
    fireEvent.change(screen.getByLabelText('From'), { target: { value: '2026-07-10' } });
    fireEvent.change(screen.getByLabelText('To'), { target: { value: '2026-07-01' } });
    await screen.findByText('The range starts after it ends.');
    expect(asked.slice(before).some((u) => u.searchParams.get('to') === '2026-07-01')).toBe(false);
  });
});
