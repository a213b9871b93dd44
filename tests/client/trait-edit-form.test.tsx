/**
 * The traits page's edit form: only what the lead changed is sent, the plausible range is typed
 * in the trait's display unit and sent in stored units (1 cm = 10 mm exactly, NIST Handbook 44,
 * Appendix C), a range running backwards is answered by the shared contract before anything is
 * sent, and the server's answer about the published sheet is shown.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { DesignTrait } from '../../common/contracts/design';
import { TraitEditForm } from '../../src/features/design/components/trait-edit-form';

const height: DesignTrait = {
  id: '00000000-0000-4000-8000-0000000000b2',
  key: 'plant_height',
  label: 'Plant height',
  quantityKind: 'length',
  basis: 'plant',
  direction: 'lower',
  scaleMin: null,
  scaleMax: null,
  sortOrder: 1,
  displayUnit: null,
  // the preset's 20 mm to 4 m (common practice, no source)
  plausibleMin: 20,
  plausibleMax: 4000,
  observationCount: 12,
};
const json = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

afterEach(() => vi.unstubAllGlobals());

function setup(trait: DesignTrait, answer: unknown) {
  const sent: { url: string; method?: string; body: unknown }[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init?: RequestInit) => {
      if (init?.method === 'PATCH') {
        sent.push({ url, method: init.method, body: JSON.parse(String(init.body)) });
        return json(200, answer);
      }
      return json(404, { error: { code: 'not_found', message: url } });
    }),
  );
  const onClose = vi.fn();
  render(
    <QueryClientProvider client={new QueryClient()}>
      <MemoryRouter>
        <TraitEditForm slug="brookfold" trait={trait} units="metric" onClose={onClose} />
      </MemoryRouter>
    </QueryClientProvider>,
  );
  return { sent, onClose, form: screen.getByRole('form', { name: `Edit ${trait.label}` }) };
}

describe('the trait edit form', () => {
  it('shows the range in cm, sends only the changed end in mm, and says to publish again', async () => {
    const { sent, form } = setup(height, { publishedVersion: 2, altersPublished: true });
    const from = within(form).getByLabelText('From') as HTMLInputElement;
    const to = within(form).getByLabelText('To') as HTMLInputElement;
    expect([from.value, to.value]).toEqual(['2', '400']);
    fireEvent.change(to, { target: { value: '350' } });
    fireEvent.change(within(form).getByLabelText('Direction'), { target: { value: 'none' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save changes' }));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]).toEqual({
      url: `/api/trials/brookfold/traits/${height.id}`,
      method: 'PATCH',
      body: { direction: 'none', plausibleMax: 3500 },
    });
    const note = await within(form).findByRole('status');
    expect(note.textContent).toBe(
      'Saved. The published sheet (version 2) still shows the trait as it was: publish a new version to show this.',
    );
    expect(within(note).getByRole('link', { name: 'publish a new version' })).toHaveProperty(
      'pathname',
      '/t/brookfold/results',
    );
  });

  it('says when the published sheet does not change', async () => {
    const { sent, form } = setup(height, { publishedVersion: 2, altersPublished: false });
    fireEvent.change(within(form).getByLabelText('From'), { target: { value: '5' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save changes' }));
    expect((await within(form).findByRole('status')).textContent).toBe(
      'Saved. The published sheet (version 2) does not change.',
    );
    expect(sent[0]!.body).toEqual({ plausibleMin: 50 });
  });

  it('answers a range running backwards with the shared contract’s message and sends nothing', async () => {
    const { sent, form } = setup(height, { publishedVersion: null, altersPublished: false });
    fireEvent.change(within(form).getByLabelText('From'), { target: { value: '500' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save changes' }));
    expect(
      await within(form).findByText(/The plausible range runs from a lower to a higher value/),
    ).toBeTruthy();
    expect(within(form).getByLabelText('To').getAttribute('aria-invalid')).toBe('true');
    expect(sent).toEqual([]);
  });

  it('offers no range for a score, and a unit choice only for lengths and masses', () => {
    const { form } = setup(
      {
        ...height,
        key: 'vigour',
        label: 'Vigour',
        quantityKind: 'score',
        direction: 'higher',
        scaleMin: 1,
        scaleMax: 5,
        plausibleMin: null,
        plausibleMax: null,
      },
      {},
    );
    expect(within(form).queryByLabelText('From')).toBeNull();
    expect(within(form).queryByLabelText('Shown in')).toBeNull();
    expect(within(form).getByLabelText('Trait name')).toHaveProperty('value', 'Vigour');
  });
});
