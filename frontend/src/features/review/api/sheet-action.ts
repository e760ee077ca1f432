import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RevisionSummaryDto, SheetDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { sheetKeys } from '../../sheets';
import { useInvalidateReview } from './use-invalidate-review';

export type SheetAction = 'return' | 'return-to-checker' | 'pass' | 'approve' | 'issue' | 'new-revision';

/** POST /api/sheets/:id/<action>: a move of the workflow (an issue answers the revision, the others the sheet). */
export const sheetAction = (sheetId: string, action: SheetAction, note?: string) =>
  api.post<SheetDto | RevisionSummaryDto>(`/sheets/${sheetId}/${action}`, note ? { note } : {});

export function useSheetAction(sheetId: string) {
  const invalidate = useInvalidateReview(sheetId);
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ action, note }: { action: SheetAction; note?: string }) => sheetAction(sheetId, action, note),
    onSuccess: (data) => {
      if ('cells' in data) qc.setQueryData(sheetKeys.one(sheetId), data);
      invalidate();
    },
  });
}
