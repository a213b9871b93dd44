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
    return d?.fields ?? [];
  }
}

type Options = Omit<RequestInit, 'body'> & {
  body?: unknown;
  query?: Record<string, string | number | undefined>;
};

/** fetch for our API: JSON in and out, cookies included, the error body turned into ApiError. */
export async function api<T>(
  path: string,
  schema: z.ZodType<T> | null,
  options: Options = {},
): Promise<T> {
  const { body, query, headers, ...rest } = options;
  const qs = query
    ? '?' +
      new URLSearchParams(
        Object.entries(query)
          .filter(([, v]) => v !== undefined)
          .map(([k, v]) => [k, String(v)]),
      ).toString()
    : '';
  let response: Response;
  try {
    response = await fetch(`${path}${qs}`, {
      credentials: 'same-origin',
      ...rest,
      headers: {
        Accept: 'application/json',
        ...(body === undefined ? {} : { 'Content-Type': 'application/json' }),
        ...headers,
      },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    throw new ApiError(0, 'network', 'No connection to Rowtally. Check the signal and try again.');
  }
  if (response.status === 204) return undefined as T;
  const payload: unknown = await response.json().catch(() => null);
  if (!response.ok) {
    const parsed = apiErrorBodySchema.safeParse(payload);
    if (parsed.success) {
      throw new ApiError(
        response.status,
        parsed.data.error.code,
        parsed.data.error.message,
        parsed.data.error.details,
      );
    }
    throw new ApiError(response.status, 'unexpected', `The server answered ${response.status}.`);
  }
  return schema ? schema.parse(payload) : (payload as T);
}
