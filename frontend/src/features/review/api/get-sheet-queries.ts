import type { QueryDto } from '@ampwright/common';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reviewKeys } from './review-keys';

/** GET /api/sheets/:id/queries: the checker's queries on a sheet, with their replies. */
export const getSheetQueries = (sheetId: string, signal?: AbortSignal) => api.get<QueryDto[]>(`/sheets/${sheetId}/queries`, { signal });

export const sheetQueriesQueryOptions = (sheetId: string) =>
  queryOptions({ queryKey: reviewKeys.queries(sheetId), queryFn: ({ signal }) => getSheetQueries(sheetId, signal) });

export const useSheetQueries = (sheetId: string) => useQuery(sheetQueriesQueryOptions(sheetId));
