import type { DiffDto } from '@ampwright/common';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reviewKeys } from './review-keys';

/** GET /api/sheets/:id/diff?from=…&to=…: two states of a sheet compared cell by cell. */
export const getDiff = (sheetId: string, from: string, to: string, signal?: AbortSignal) =>
  api.get<DiffDto>(`/sheets/${sheetId}/diff?from=${from}&to=${to}`, { signal });

export const diffQueryOptions = (sheetId: string, from: string, to: string) =>
  queryOptions({
    queryKey: reviewKeys.diff(sheetId, from, to),
    queryFn: ({ signal }) => getDiff(sheetId, from, to, signal),
    enabled: !!from && !!to && from !== to,
  });

export const useDiff = (sheetId: string, from: string, to: string) => useQuery(diffQueryOptions(sheetId, from, to));
