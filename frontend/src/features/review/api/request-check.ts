import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SheetDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { sheetKeys } from '../../sheets';
import { useInvalidateReview } from './use-invalidate-review';

/** POST /api/sheets/:id/request-check: names the checker (and the approver) and hands the sheet over. */
export const requestCheck = (sheetId: string, body: { checkerId: string; approverId?: string }) => api.post<SheetDto>(`/sheets/${sheetId}/request-check`, body);

export function useRequestCheck(sheetId: string) {
  const invalidate = useInvalidateReview(sheetId);
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { checkerId: string; approverId?: string }) => requestCheck(sheetId, body),
    onSuccess: (data) => {
      qc.setQueryData(sheetKeys.one(sheetId), data);
      invalidate();
    },
  });
}
