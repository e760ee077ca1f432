import type { QueryDto } from '@ampwright/common';
import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateReview } from './use-invalidate-review';

/** POST /api/queries/:id/replies. */
export const replyToQuery = ({ id, text }: { id: string; text: string }) => api.post<QueryDto>(`/queries/${id}/replies`, { text });

export function useReply(sheetId: string) {
  return useMutation({ mutationFn: replyToQuery, onSuccess: useInvalidateReview(sheetId) });
}
