/**
 * Three forms on their endpoints' contracts: the photo tags, the weather station import and the
 * follow form on the public sheet. The contract's message is the message shown beside the
 * field, nothing is sent while a field is refused, and what is sent is the contract's output.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Photo, PhotoTagging } from '../../common/contracts/photos';
import { WeatherImport } from '../../src/features/analysis/components/weather-import';
import { EditTags } from '../../src/features/photos/components/photo-lightbox';
import { FollowForm } from '../../src/features/results/components/follow-form';

const json = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

afterEach(() => vi.unstubAllGlobals());

/** Records each request's method, url and JSON body, and answers with `answer(url, body)`. */
function stubFetch(answer: (url: string, body: any) => Response) {
  const sent: { method: string; url: string; body: any }[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init?: RequestInit) => {
      const body = init?.body ? JSON.parse(String(init.body)) : undefined;
      sent.push({ method: init?.method ?? 'GET', url, body });
      return answer(url, body);
    }),
  );
  return sent;
}

const wrap = (ui: React.ReactNode) =>
  render(
    <QueryClientProvider client={new QueryClient()}>
      <MemoryRouter>{ui}</MemoryRouter>
    </QueryClientProvider>,
  );

const entryA = '00000000-0000-4000-8000-00000000000a';
const entryB = '00000000-0000-4000-8000-00000000000b';
const plotA = '00000000-0000-4000-8000-0000000000a1';
const siteId = '00000000-0000-4000-8000-0000000000c1';
const tagging: PhotoTagging = {
  entries: [
    { id: entryA, code: 'E1', name: 'Marrowdale Long', coverPhotoId: null },
    { id: entryB, code: 'E2', name: 'Tansy Ribbed', coverPhotoId: null },
  ],
  plots: [
    { id: plotA, entryId: entryA, siteId, siteName: 'Hollin Yard', plotNumber: 101, block: 1 },
  ],
  permissions: { upload: true, chooseCover: true },
  limits: {
    maxBytes: 10_000_000,
    maxFiles: 20,
    maxPixels: 50_000_000,
    acceptedTypes: ['image/jpeg'],
    heicReadable: false,
  },
};
const photo: Photo = {
  id: '00000000-0000-4000-8000-0000000000f1',
  entryId: entryA,
  plotId: plotA,
  takenOn: '2026-07-15',
  capturedAt: null,
  caption: 'Pods at first pick',
  subject: 'fruit',
  mimeType: 'image/jpeg',
  width: 1200,
  height: 900,
  bytes: 150_000,
  thumbWidth: 400,
  thumbHeight: 300,
  displayWidth: 1200,
  displayHeight: 900,
  isCover: false,
  uploadedBy: null,
  createdAt: '2026-07-15T09:00:00.000Z',
  deletedAt: null,
  canEdit: true,
  urls: { thumb: '/t.jpg', display: '/d.jpg', original: null },
};

describe('the photo tag form', () => {
  it("answers a blank caption with the contract's message and sends nothing", async () => {
    const sent = stubFetch(() => json(500, {}));
    const onDone = vi.fn();
    wrap(<EditTags slug="hollin" photo={photo} tagging={tagging} onDone={onDone} />);
    const form = screen.getByRole('form', { name: 'Photo tags' });
    fireEvent.change(within(form).getByLabelText(/^Caption/), { target: { value: '   ' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save tags' }));
    await screen.findByText(/Describe the photo: the caption is what people hear/);
    expect(
      within(form)
        .getByLabelText(/^Caption/)
        .getAttribute('aria-invalid'),
    ).toBe('true');
    expect(sent).toEqual([]);
    expect(onDone).not.toHaveBeenCalled();
  });

  it('clears a plot that is not in the newly chosen entry, and sends blanks as "not said"', async () => {
    const sent = stubFetch(() => json(200, { photo }));
    const onDone = vi.fn();
    wrap(<EditTags slug="hollin" photo={photo} tagging={tagging} onDone={onDone} />);
    const form = screen.getByRole('form', { name: 'Photo tags' });
    fireEvent.change(within(form).getByLabelText('Entry'), { target: { value: entryB } });
    expect((within(form).getByLabelText('Plot') as HTMLSelectElement).value).toBe('');
    fireEvent.change(within(form).getByLabelText('Subject'), { target: { value: '' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save tags' }));
    await waitFor(() => expect(onDone).toHaveBeenCalled());
    expect(sent[0]).toEqual({
      method: 'PATCH',
      url: `/api/trials/hollin/photos/${photo.id}`,
      body: {
        caption: 'Pods at first pick',
        entryId: entryB,
        plotId: null,
        takenOn: '2026-07-15',
        subject: null,
      },
    });
  });

  it("shows the server's refusal of a field beside that field", async () => {
    stubFetch(() =>
      json(400, {
        error: {
          code: 'validation',
          message: 'Check the tags.',
          details: { fields: [{ path: 'body.takenOn', message: 'That day is in the future.' }] },
        },
      }),
    );
    wrap(<EditTags slug="hollin" photo={photo} tagging={tagging} onDone={vi.fn()} />);
    const form = screen.getByRole('form', { name: 'Photo tags' });
    fireEvent.click(within(form).getByRole('button', { name: 'Save tags' }));
    await screen.findByText('That day is in the future.');
    expect(within(form).getByLabelText('Date taken').getAttribute('aria-invalid')).toBe('true');
  });
});

describe('the weather station import', () => {
  const sites = [{ id: siteId, name: 'Hollin Yard' }];
  const preview = {
    dryRun: true,
    columns: { date: 'date', tmin: 'tmin', tmax: 'tmax', rain: 'rain' },
    rows: [{ row: 2, date: '2026-06-01', tminC: 10, tmaxC: 20, rainMm: 1.2, replaces: false }],
    errors: [],
    written: 0,
  };

  it("answers an empty file with the contract's message and sends nothing", async () => {
    const sent = stubFetch(() => json(500, {}));
    wrap(<WeatherImport slug="hollin" sites={sites} />);
    fireEvent.click(screen.getByRole('button', { name: 'Check the file' }));
    await screen.findByText('Paste or upload the station file.');
    expect(screen.getByLabelText('Station file').getAttribute('aria-invalid')).toBe('true');
    expect(sent).toEqual([]);
  });

  it('checks first, then imports the same file in the units chosen', async () => {
    const sent = stubFetch((_url, body) =>
      json(200, body.dryRun ? preview : { ...preview, dryRun: false, written: 1 }),
    );
    wrap(<WeatherImport slug="hollin" sites={sites} />);
    const csv = 'date,tmin,tmax,rain\n2026-06-01,50,68,0.05\n';
    fireEvent.change(screen.getByLabelText('Station file'), { target: { value: csv } });
    fireEvent.change(screen.getByLabelText('Temperatures in'), { target: { value: 'F' } });
    fireEvent.change(screen.getByLabelText('Rain in'), { target: { value: 'in' } });
    expect(screen.getByRole('button', { name: /^Import/ })).toHaveProperty('disabled', true);
    fireEvent.click(screen.getByRole('button', { name: 'Check the file' }));
    await screen.findByText(/1 days ready \(0 replace stored days\); 0 problems\./);
    fireEvent.click(screen.getByRole('button', { name: 'Import 1 days' }));
    await screen.findByText('1 days imported.');
    const body = { siteId, csv, temperatureUnit: 'F', rainUnit: 'in' };
    expect(sent.map((s) => [s.url, s.body])).toEqual([
      ['/api/trials/hollin/weather/import', { ...body, dryRun: true }],
      ['/api/trials/hollin/weather/import', { ...body, dryRun: false }],
    ]);
  });
});

describe('the follow form on the public sheet', () => {
  it("answers a malformed address with the contract's message and sends nothing", async () => {
    const sent = stubFetch(() => json(500, {}));
    wrap(<FollowForm slug="hollin" />);
    const email = screen.getByLabelText('E-mail me when new results are published');
    fireEvent.change(email, { target: { value: 'grower.at.example.org' } });
    fireEvent.click(screen.getByRole('button', { name: 'Follow' }));
    await screen.findByText('Enter an e-mail address like name@example.org.');
    expect(email.getAttribute('aria-invalid')).toBe('true');
    expect(sent).toEqual([]);
  });

  it('sends the address and says to open the link in the mail', async () => {
    const sent = stubFetch(() => json(202, { message: 'We sent a link to confirm.' }));
    wrap(<FollowForm slug="hollin" />);
    fireEvent.change(screen.getByLabelText('E-mail me when new results are published'), {
      target: { value: 'Wren.Ashby@example.org' },
    });
    fireEvent.click(screen.getByRole('button', { name: 'Follow' }));
    await screen.findByText('We sent a link to confirm. Open the link in it to start following.');
    // The contract lower-cases the address before it is sent.
    expect(sent).toEqual([
      {
        method: 'POST',
        url: '/api/results/hollin/followers',
        body: { email: 'wren.ashby@example.org' },
      },
    ]);
  });
});
