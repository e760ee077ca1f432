import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { useInvalidateReview } from './use-invalidate-review';

/** PUT or DELETE /api/sheets/:id/cells/:cellId/agreement: the checker agrees a cell, or takes the agreement back. */
export const setAgreement = (sheetId: string, { cellId, agreed }: { cellId: string; agreed: boolean }) =>
  agreed ? api.put<void>(`/sheets/${sheetId}/cells/${cellId}/agreement`) : api.delete<void>(`/sheets/${sheetId}/cells/${cellId}/agreement`);

export function useAgreement(sheetId: string) {
  return useMutation({ mutationFn: (body: { cellId: string; agreed: boolean }) => setAgreement(sheetId, body), onSuccess: useInvalidateReview(sheetId) });
}
