import type { QueryDto } from '@ampwright/common';
import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateReview } from './use-invalidate-review';

/** POST /api/queries/:id/close: the checker closes a query, with a note or without. */
export const closeQuery = ({ id, note }: { id: string; note?: string }) => api.post<QueryDto>(`/queries/${id}/close`, note ? { note } : {});

export function useCloseQuery(sheetId: string) {
  return useMutation({ mutationFn: closeQuery, onSuccess: useInvalidateReview(sheetId) });
}
