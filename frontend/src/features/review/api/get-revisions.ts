import type { RevisionSummaryDto } from '@ampwright/common';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reviewKeys } from './review-keys';

/** GET /api/sheets/:id/revisions: the issued revisions of a sheet. */
export const getRevisions = (sheetId: string, signal?: AbortSignal) => api.get<RevisionSummaryDto[]>(`/sheets/${sheetId}/revisions`, { signal });

export const revisionsQueryOptions = (sheetId: string) =>
  queryOptions({ queryKey: reviewKeys.revisions(sheetId), queryFn: ({ signal }) => getRevisions(sheetId, signal) });

export const useRevisions = (sheetId: string) => useQuery(revisionsQueryOptions(sheetId));
