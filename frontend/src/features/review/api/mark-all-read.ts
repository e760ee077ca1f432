import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reviewKeys } from './review-keys';

/** POST /api/notifications/read-all. */
export const markAllRead = () => api.post<void>('/notifications/read-all');

export function useMarkAllRead() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: markAllRead, onSuccess: () => qc.invalidateQueries({ queryKey: reviewKeys.notifications }) });
}
