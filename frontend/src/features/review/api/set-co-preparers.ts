import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CoPreparersBody, SheetDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { sheetKeys } from '../../sheets';

/** PUT /api/sheets/:id/co-preparers: the preparer names the co-preparers (they may edit, and then cannot check or approve). */
export const setCoPreparers = (sheetId: string, body: CoPreparersBody) => api.put<SheetDto>(`/sheets/${sheetId}/co-preparers`, body);

export function useCoPreparers(sheetId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CoPreparersBody) => setCoPreparers(sheetId, body),
    onSuccess: (data) => qc.setQueryData(sheetKeys.one(sheetId), data),
  });
}
