/**
 * The one client write path: any body through `api` on an injected fetch, every answer read
 * one way (the contract's parse, or an ApiError from the error body), and the photo upload's
 * XMLHttpRequest refused exactly as fetch is.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { analyzeSpreadsheet } from '../../src/features/analysis/api/analyze-spreadsheet';
import { uploadPhoto } from '../../src/features/photos/api/upload-photo';
import { ApiError, apiUpload, createApiClient, type FetchLike } from '../../src/lib/api-client';

const json = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

const refusal = {
  error: {
    code: 'validation_failed',
    message: 'Check the highlighted fields.',
    details: {
      fields: [
        { path: 'body.massG', message: 'Enter the mass in grams.' },
        { path: 'body.plots.1.gaps', message: 'Gaps cannot exceed the plants set.' },
        { path: 'body.massG', message: 'A second message for the same field.' },
      ],
    },
  },
};

/** A fetch that records each request and answers with `answer`. */
function recording(answer: () => Response | Promise<Response>) {
  const calls: { url: string; init: RequestInit }[] = [];
  const send: FetchLike = async (url, init) => {
    calls.push({ url, init });
    return answer();
  };
  return { calls, api: createApiClient(send) };
}

afterEach(() => vi.unstubAllGlobals());

describe('api', () => {
  it('sends a JSON body with its type, cookies and the query (undefined left out, empty kept)', async () => {
    const { calls, api } = recording(() => json(201, { id: 'h-1' }));
    const out = await api('/api/trials/larkmead/harvests', z.object({ id: z.string() }), {
      method: 'POST',
      body: { massG: 180 },
      query: { site: undefined, layout: '', alpha: 0.05 },
    });
    expect(out).toEqual({ id: 'h-1' });
    expect(calls).toHaveLength(1);
    expect(calls[0]!.url).toBe('/api/trials/larkmead/harvests?layout=&alpha=0.05');
    expect(calls[0]!.init.method).toBe('POST');
    expect(calls[0]!.init.credentials).toBe('same-origin');
    expect(calls[0]!.init.body).toBe('{"massG":180}');
    expect(calls[0]!.init.headers).toEqual({
      Accept: 'application/json',
      'Content-Type': 'application/json',
    });
  });

  it('sends FormData and Blob bodies unchanged, leaving their type to the browser', async () => {
    const { calls, api } = recording(() => new Response(null, { status: 204 }));
    const form = new FormData();
    form.append('caption', 'Pods at first pick');
    const csv = new Blob(['variety,block,yield\nA,1,3.2\n'], { type: 'text/csv' });
    await expect(api('/x', null, { method: 'POST', body: form })).resolves.toBeUndefined();
    await expect(api('/y', null, { method: 'POST', body: csv })).resolves.toBeUndefined();
    expect(calls[0]!.init.body).toBe(form);
    expect(calls[1]!.init.body).toBe(csv);
    for (const c of calls) expect(c.init.headers).toEqual({ Accept: 'application/json' });
  });

  it('reads a refusal into an ApiError: code, message, fields by path, one line of text', async () => {
    const { api } = recording(() => json(400, refusal));
    const err = await api('/x', null, { method: 'POST', body: {} }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    const e = err as ApiError;
    expect([e.status, e.code, e.message]).toEqual([
      400,
      'validation_failed',
      'Check the highlighted fields.',
    ]);
    expect(e.fieldMessages).toEqual({
      massG: 'Enter the mass in grams.',
      'plots.1.gaps': 'Gaps cannot exceed the plants set.',
    });
    expect(e.summary).toBe(
      'Enter the mass in grams. Gaps cannot exceed the plants set. A second message for the same field.',
    );
  });

  it('an answer that is not our error body still gives its status', async () => {
    const { api } = recording(
      () =>
        new Response('<html>Bad gateway</html>', {
          status: 502,
          headers: { 'Content-Type': 'text/html' },
        }),
    );
    await expect(api('/x', null)).rejects.toMatchObject({
      status: 502,
      code: 'unexpected',
      message: 'The server answered 502.',
    });
  });

  it('no connection is status 0, "network"', async () => {
    const api = createApiClient(() => Promise.reject(new TypeError('Failed to fetch')));
    await expect(api('/x', null)).rejects.toMatchObject({ status: 0, code: 'network' });
  });

  it('an answer the contract does not accept is refused, not passed on', async () => {
    const { api } = recording(() => json(200, { id: 42 }));
    await expect(api('/x', z.object({ id: z.string() }))).rejects.toMatchObject({
      status: 200,
      code: 'unexpected',
    });
  });

  it('the spreadsheet analysis goes through it as a text/csv body with the options in the query', async () => {
    const calls: { url: string; init: RequestInit }[] = [];
    vi.stubGlobal(
      'fetch',
      vi.fn(async (url: string, init: RequestInit) => {
        calls.push({ url, init });
        return json(422, {
          error: { code: 'validation_failed', message: 'Choose the value column.' },
        });
      }),
    );
    const csv = 'variety,block,yield\nA,1,3.2\n';
    await expect(analyzeSpreadsheet(csv, { value: 'yield', block: '' })).rejects.toMatchObject({
      status: 422,
      message: 'Choose the value column.',
    });
    expect(calls[0]!.url).toBe('/api/analyze?value=yield&block=');
    const body = calls[0]!.init.body as Blob;
    expect(body.type).toBe('text/csv');
    await expect(body.text()).resolves.toBe(csv);
  });
});

/** Just enough of XMLHttpRequest to answer one upload. */
class FakeXhr {
  static last: FakeXhr | null = null;
  static answer: { status: number; text: string } = { status: 201, text: '' };
  upload: { onprogress: ((e: ProgressEvent) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  withCredentials = false;
  status = 0;
  responseText = '';
  method = '';
  url = '';
  headers: Record<string, string> = {};
  sent: unknown;
  constructor() {
    FakeXhr.last = this;
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(k: string, v: string) {
    this.headers[k] = v;
  }
  abort() {
    this.onabort?.();
  }
  send(body: unknown) {
    this.sent = body;
    queueMicrotask(() => {
      this.upload.onprogress?.({ lengthComputable: true, loaded: 50, total: 100 } as ProgressEvent);
      this.status = FakeXhr.answer.status;
      this.responseText = FakeXhr.answer.text;
      this.onload?.();
    });
  }
}

describe('apiUpload', () => {
  it('reads a refused upload exactly as api reads a refused fetch', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    FakeXhr.answer = { status: 400, text: JSON.stringify(refusal) };
    const viaXhr = await apiUpload('/u', z.object({}), { body: new FormData() }).catch(
      (e: unknown) => e as ApiError,
    );
    const { api } = recording(() => json(400, refusal));
    const viaFetch = (await api('/u', null).catch((e: unknown) => e)) as ApiError;
    expect(viaXhr).toBeInstanceOf(ApiError);
    for (const e of [viaXhr, viaFetch]) expect(e.status).toBe(400);
    expect(viaXhr.code).toBe(viaFetch.code);
    expect(viaXhr.message).toBe(viaFetch.message);
    expect(viaXhr.fieldMessages).toEqual(viaFetch.fieldMessages);
  });

  it('the photo upload sends FormData with cookies, reports progress and returns the stored photo', async () => {
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    const photo = {
      id: '00000000-0000-4000-8000-0000000000a1',
      entryId: null,
      plotId: null,
      takenOn: '2026-08-14',
      capturedAt: null,
      caption: 'Pods at first pick',
      subject: null,
      mimeType: 'image/jpeg',
      width: 1600,
      height: 1200,
      bytes: 181_000,
      thumbWidth: 320,
      thumbHeight: 240,
      displayWidth: 1600,
      displayHeight: 1200,
      isCover: false,
      uploadedBy: { id: 'u-1', name: 'Odile Farrant' },
      createdAt: '2026-08-14T09:30:00.000Z',
      deletedAt: null,
      canEdit: true,
      urls: { thumb: '/media/t.jpg', display: '/media/d.jpg', original: null },
    };
    const progress: number[] = [];
    const file = new File(['jpeg bytes'], 'pods.jpg', { type: 'image/jpeg' });
    FakeXhr.answer = { status: 201, text: JSON.stringify({ photos: [photo] }) };
    await expect(
      uploadPhoto('larkmead', file, { caption: 'Pods at first pick' }, (p) =>
        progress.push(p.loaded / p.total),
      ),
    ).resolves.toEqual(photo);
    const xhr = FakeXhr.last!;
    expect([xhr.method, xhr.url, xhr.withCredentials]).toEqual([
      'POST',
      '/api/trials/larkmead/photos',
      true,
    ]);
    expect((xhr.sent as FormData).get('photo')).toBeInstanceOf(File);
    expect(progress).toEqual([0.5]);
    expect((xhr.sent as FormData).get('caption')).toBe('Pods at first pick');
    // The answer is checked by the upload contract: an incomplete photo is refused, not returned.
    FakeXhr.answer = { status: 201, text: JSON.stringify({ photos: [{ id: photo.id }] }) };
    await expect(uploadPhoto('larkmead', file, { caption: '' }, () => {})).rejects.toMatchObject({
      code: 'unexpected',
    });
  });
});
