import { type PublishedSheetsQuery, publishedSheetListSchema } from '@common/contracts/results';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

type Query = Pick<PublishedSheetsQuery, 'q' | 'page'>;

export const getPublishedSheets = ({ q, page }: Query) =>
  api('/api/results', publishedSheetListSchema, { query: { q, page } });

export const publishedSheetsQueryOptions = (query: Query) =>
  queryOptions({
    queryKey: trialKeys.publishedIndex(query),
    queryFn: () => getPublishedSheets(query),
    // The old page stays on screen while the next one loads.
    placeholderData: keepPreviousData,
  });

export const usePublishedSheets = (query: Query) => useQuery(publishedSheetsQueryOptions(query));
