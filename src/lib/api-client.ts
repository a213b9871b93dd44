/**
 * The one way the client talks to the API: any body (JSON, FormData, a Blob such as a CSV
 * file), cookies included, an injectable fetch, and one reading of every answer: the value
 * parsed by the endpoint's contract, or an ApiError from the error body.
 */
import { apiErrorBodySchema, type FieldIssue } from '@common/api-error';
import type { z } from 'zod';

/** A failed API call, carrying the server's error code, message and per-field issues. */
export class ApiError extends Error {
  override name = 'ApiError';
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }

  get fields(): FieldIssue[] {
    const d = this.details as { fields?: FieldIssue[] } | undefined;
    return Array.isArray(d?.fields) ? d.fields : [];
  }

  /** The first message per field, by the field's path in the body: `body.plots.1.gaps` → `plots.1.gaps`. */
  get fieldMessages(): Record<string, string> {
    const out: Record<string, string> = {};
    for (const f of this.fields) out[f.path.replace(/^body\./, '')] ??= f.message;
    return out;
  }

  /** Every field's message, or the general message when there are none: for one line of text. */
  get summary(): string {
    return this.fields.map((f) => f.message).join(' ') || this.message;
  }
}

export const networkError = () =>
  new ApiError(0, 'network', 'No connection to Rowtally. Check the signal and try again.');

/** The ApiError for a refused request, from its status and whatever body came with it. */
export function readApiError(status: number, payload: unknown): ApiError {
  const parsed = apiErrorBodySchema.safeParse(payload);
  return parsed.success
    ? new ApiError(
        status,
        parsed.data.error.code,
        parsed.data.error.message,
        parsed.data.error.details,
      )
    : new ApiError(status, 'unexpected', `The server answered ${status}.`);
}

/** The value of an answer: the contract's parse of a success, else the ApiError thrown. */
export function readAnswer<T>(status: number, payload: unknown, schema: z.ZodType<T> | null): T {
  if (status < 200 || status >= 300) throw readApiError(status, payload);
  if (status === 204 || !schema) return payload as T;
  const parsed = schema.safeParse(payload);
  if (!parsed.success)
    throw new ApiError(status, 'unexpected', 'The server sent an answer we could not read.');
  return parsed.data;
}

const parseJson = (text: string): unknown => {
  try {
    return text === '' ? null : JSON.parse(text);
  } catch {
    return null; // not JSON: read as "no body" and reported by status
  }
};

/** Query values are sent as `String(value)`. */
export type Query = Record<string, unknown>;

/** `path?query`, leaving out undefined values (an empty string is sent: it can mean "none"). */
export function withQuery(path: string, query?: Query): string {
  if (!query) return path;
  const qs = new URLSearchParams(
    Object.entries(query)
      .filter(([, v]) => v !== undefined)
      .map(([k, v]) => [k, String(v)]),
  ).toString();
  return qs ? `${path}?${qs}` : path;
}

/** Bodies sent as they are (the browser sets their type); anything else goes as JSON. */
const isRawBody = (body: unknown): body is BodyInit =>
  body instanceof FormData ||
  body instanceof Blob ||
  body instanceof URLSearchParams ||
  body instanceof ArrayBuffer;

export type ApiOptions = Omit<RequestInit, 'body'> & {
  /** A JSON value, or FormData / Blob / URLSearchParams / ArrayBuffer sent unchanged. */
  body?: unknown;
  query?: Query;
};

export type FetchLike = (input: string, init: RequestInit) => Promise<Response>;

/** An `api` function over the given fetch (tests and the outbox pass their own). */
export function createApiClient(send: FetchLike = (input, init) => fetch(input, init)) {
  return async function api<T>(
    path: string,
    schema: z.ZodType<T> | null,
    options: ApiOptions = {},
  ): Promise<T> {
    const { body, query, headers, ...rest } = options;
    const json = body !== undefined && !isRawBody(body);
    let response: Response;
    try {
      response = await send(withQuery(path, query), {
        credentials: 'same-origin',
        ...rest,
        headers: {
          Accept: 'application/json',
          ...(json ? { 'Content-Type': 'application/json' } : {}),
          ...headers,
        },
        body: body === undefined ? undefined : json ? JSON.stringify(body) : (body as BodyInit),
      });
    } catch {
      throw rest.signal?.aborted ? new ApiError(0, 'cancelled', 'Cancelled.') : networkError();
    }
    const payload = response.status === 204 ? undefined : parseJson(await response.text());
    return readAnswer(response.status, payload, schema);
  };
}

/** The app's API client, on the browser's fetch. */
export const api = createApiClient();

/** A multipart body: the text fields as strings (undefined and null left out), then the file. */
export function multipartBody(
  fields: Record<string, unknown>,
  file: { field: string; blob: Blob; name: string },
): FormData {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields))
    if (v !== undefined && v !== null) form.append(k, String(v));
  form.append(file.field, file.blob, file.name);
  return form;
}

export interface UploadProgress {
  loaded: number;
  total: number;
}

/**
 * A FormData upload that reports progress (fetch cannot), answered and refused exactly as
 * `api` reads answers.
 */
export function apiUpload<T>(
  path: string,
  schema: z.ZodType<T>,
  options: {
    body: FormData;
    onProgress?: (p: UploadProgress) => void;
    signal?: AbortSignal;
    method?: 'POST' | 'PUT';
  },
): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open(options.method ?? 'POST', path);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) options.onProgress?.({ loaded: e.loaded, total: e.total });
    };
    xhr.onload = () => {
      try {
        resolve(readAnswer(xhr.status, parseJson(xhr.responseText), schema));
      } catch (err) {
        reject(err);
      }
    };
    xhr.onerror = () => reject(networkError());
    xhr.onabort = () => reject(new ApiError(0, 'cancelled', 'Cancelled.'));
    const { signal } = options;
    if (signal) {
      if (signal.aborted) return xhr.abort();
      signal.addEventListener('abort', () => xhr.abort(), { once: true });
    }
    xhr.send(options.body);
  });
}
