import { apiErrorBodySchema } from '@common/api-error';
import { type AnalyzeOptionsInput, analysisResultSchema } from '@common/contracts/analysis';
import { useMutation } from '@tanstack/react-query';
import { ApiError } from '@/lib/api-client';

/**
 * The spreadsheet goes as a text/csv body (up to 2 MB; the JSON route is capped lower), the
 * options in the query string. Nothing is stored, so nothing is invalidated.
 */
export async function analyzeSpreadsheet(csv: string, options: AnalyzeOptionsInput) {
  const qs = new URLSearchParams(
    Object.entries(options)
      // An empty layout column is sent on purpose: "this sheet has none".
      .filter(([, v]) => v !== undefined)
      .map(([k, v]) => [k, String(v)]),
  ).toString();
  let response: Response;
  try {
    response = await fetch(`/api/analyze${qs ? `?${qs}` : ''}`, {
      method: 'POST',
      credentials: 'same-origin',
      headers: { 'Content-Type': 'text/csv', Accept: 'application/json' },
      body: csv,
    });
  } catch {
    throw new ApiError(0, 'network', 'No connection to Rowtally. Check the signal and try again.');
  }
  const payload: unknown = await response.json().catch(() => null);
  if (!response.ok) {
    const parsed = apiErrorBodySchema.safeParse(payload);
    if (parsed.success)
      throw new ApiError(
        response.status,
        parsed.data.error.code,
        parsed.data.error.message,
        parsed.data.error.details,
      );
    throw new ApiError(response.status, 'unexpected', `The server answered ${response.status}.`);
  }
  return analysisResultSchema.parse(payload);
}

export const useAnalyzeSpreadsheet = () =>
  useMutation({
    mutationFn: ({ csv, options }: { csv: string; options: AnalyzeOptionsInput }) =>
      analyzeSpreadsheet(csv, options),
  });
