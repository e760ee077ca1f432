import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sheetKeys } from './sheet-keys';

/** DELETE /api/attachments/:id. */
export const deleteAttachment = (id: string) => api.delete<void>(`/attachments/${id}`);

export function useDeleteAttachment(sheetId: string) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deleteAttachment, onSuccess: () => queryClient.invalidateQueries({ queryKey: sheetKeys.attachments(sheetId) }) });
}
