import type { HistoryEventDto } from '@ampwright/common';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reviewKeys } from './review-keys';

/** GET /api/sheets/:id/history: what happened to a sheet, in order. */
export const getHistory = (sheetId: string, signal?: AbortSignal) => api.get<HistoryEventDto[]>(`/sheets/${sheetId}/history`, { signal });

export const historyQueryOptions = (sheetId: string) =>
  queryOptions({ queryKey: reviewKeys.history(sheetId), queryFn: ({ signal }) => getHistory(sheetId, signal) });

export const useHistory = (sheetId: string) => useQuery(historyQueryOptions(sheetId));
