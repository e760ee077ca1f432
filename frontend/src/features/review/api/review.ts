import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CoPreparersBody, DiffDto, HistoryEventDto, NotificationDto, QueryDto, RevisionSummaryDto, SheetDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { projectKeys } from '../../projects';
import { sheetKeys } from '../../sheets';

export type { QueryDto, RevisionSummaryDto, DiffDto, HistoryEventDto, NotificationDto };

export const reviewKeys = {
  queries: (sheetId: string) => ['sheets', sheetId, 'queries'] as const,
  revisions: (sheetId: string) => ['sheets', sheetId, 'revisions'] as const,
  history: (sheetId: string) => ['sheets', sheetId, 'history'] as const,
  diff: (sheetId: string, from: string, to: string) => ['sheets', sheetId, 'diff', from, to] as const,
  notifications: ['notifications'] as const,
};

export const useSheetQueries = (sheetId: string) =>
  useQuery(queryOptions({ queryKey: reviewKeys.queries(sheetId), queryFn: ({ signal }) => api.get<QueryDto[]>(`/sheets/${sheetId}/queries`, { signal }) }));
export const useRevisions = (sheetId: string) =>
  useQuery(
    queryOptions({
      queryKey: reviewKeys.revisions(sheetId),
      queryFn: ({ signal }) => api.get<RevisionSummaryDto[]>(`/sheets/${sheetId}/revisions`, { signal }),
    }),
  );
export const useHistory = (sheetId: string) =>
  useQuery(
    queryOptions({ queryKey: reviewKeys.history(sheetId), queryFn: ({ signal }) => api.get<HistoryEventDto[]>(`/sheets/${sheetId}/history`, { signal }) }),
  );
export const useDiff = (sheetId: string, from: string, to: string) =>
  useQuery({
    queryKey: reviewKeys.diff(sheetId, from, to),
    queryFn: ({ signal }) => api.get<DiffDto>(`/sheets/${sheetId}/diff?from=${from}&to=${to}`, { signal }),
    enabled: !!from && !!to && from !== to,
  });
export const useNotifications = (enabled: boolean) =>
  useQuery({
    queryKey: reviewKeys.notifications,
    queryFn: ({ signal }) => api.get<NotificationDto[]>('/notifications', { signal }),
    enabled,
    refetchInterval: 30_000,
  });

/** After any review action: the sheet, its queries, revisions and history, and the lists that count them. */
function useInvalidateReview(sheetId: string) {
  const qc = useQueryClient();
  return () => {
    void qc.invalidateQueries({ queryKey: sheetKeys.one(sheetId) }); // and everything under it: queries, revisions, history
    void qc.invalidateQueries({ queryKey: projectKeys.all });
    void qc.invalidateQueries({ queryKey: reviewKeys.notifications });
  };
}

export type SheetAction = 'return' | 'return-to-checker' | 'pass' | 'approve' | 'issue' | 'new-revision';

export function useSheetAction(sheetId: string) {
  const invalidate = useInvalidateReview(sheetId);
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ action, note }: { action: SheetAction; note?: string }) =>
      api.post<SheetDto | RevisionSummaryDto>(`/sheets/${sheetId}/${action}`, note ? { note } : {}),
    onSuccess: (data) => {
      if ('cells' in data) qc.setQueryData(sheetKeys.one(sheetId), data);
      invalidate();
    },
  });
}

export function useRequestCheck(sheetId: string) {
  const invalidate = useInvalidateReview(sheetId);
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { checkerId: string; approverId?: string }) => api.post<SheetDto>(`/sheets/${sheetId}/request-check`, body),
    onSuccess: (data) => {
      qc.setQueryData(sheetKeys.one(sheetId), data);
      invalidate();
    },
  });
}

/** The preparer names the co-preparers of the revision (they may edit it, and then cannot check or approve it). */
export function useCoPreparers(sheetId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CoPreparersBody) => api.put<SheetDto>(`/sheets/${sheetId}/co-preparers`, body),
    onSuccess: (data) => qc.setQueryData(sheetKeys.one(sheetId), data),
  });
}

export function useRaiseQuery(sheetId: string) {
  const invalidate = useInvalidateReview(sheetId);
  return useMutation({
    mutationFn: (body: { cellId: string; line?: number; text: string }) => api.post<QueryDto>(`/sheets/${sheetId}/queries`, body),
    onSuccess: invalidate,
  });
}

export function useReply(sheetId: string) {
  const invalidate = useInvalidateReview(sheetId);
  return useMutation({
    mutationFn: ({ id, text }: { id: string; text: string }) => api.post<QueryDto>(`/queries/${id}/replies`, { text }),
    onSuccess: invalidate,
  });
}

export function useCloseQuery(sheetId: string) {
  const invalidate = useInvalidateReview(sheetId);
  return useMutation({
    mutationFn: ({ id, note }: { id: string; note?: string }) => api.post<QueryDto>(`/queries/${id}/close`, note ? { note } : {}),
    onSuccess: invalidate,
  });
}

export function useAgreement(sheetId: string) {
  const invalidate = useInvalidateReview(sheetId);
  return useMutation({
    mutationFn: ({ cellId, agreed }: { cellId: string; agreed: boolean }) =>
      agreed ? api.put<void>(`/sheets/${sheetId}/cells/${cellId}/agreement`) : api.delete<void>(`/sheets/${sheetId}/cells/${cellId}/agreement`),
    onSuccess: invalidate,
  });
}

export function useMarkAllRead() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<void>('/notifications/read-all'),
    onSuccess: () => qc.invalidateQueries({ queryKey: reviewKeys.notifications }),
  });
}
