import type { QueryDto } from '@ampwright/common';
import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateReview } from './use-invalidate-review';

export interface RaiseQueryBody {
  cellId: string;
  line?: number;
  text: string;
}

/** POST /api/sheets/:id/queries: the checker raises a query on a cell (or one of its lines). */
export const raiseQuery = (sheetId: string, body: RaiseQueryBody) => api.post<QueryDto>(`/sheets/${sheetId}/queries`, body);

export function useRaiseQuery(sheetId: string) {
  return useMutation({ mutationFn: (body: RaiseQueryBody) => raiseQuery(sheetId, body), onSuccess: useInvalidateReview(sheetId) });
}
