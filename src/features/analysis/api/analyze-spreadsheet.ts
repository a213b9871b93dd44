import { type AnalyzeOptionsInput, analysisResultSchema } from '@common/contracts/analysis';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/**
 * The spreadsheet goes as a text/csv body (up to 2 MB; the JSON route is capped lower), the
 * options in the query string (an empty layout column is sent on purpose: "this sheet has
 * none"). Nothing is stored, so nothing is invalidated.
 */
export const analyzeSpreadsheet = (csv: string, options: AnalyzeOptionsInput) =>
  api('/api/analyze', analysisResultSchema, {
    method: 'POST',
    query: options,
    body: new Blob([csv], { type: 'text/csv' }),
  });

export const useAnalyzeSpreadsheet = () =>
  useMutation({
    mutationFn: ({ csv, options }: { csv: string; options: AnalyzeOptionsInput }) =>
      analyzeSpreadsheet(csv, options),
  });
