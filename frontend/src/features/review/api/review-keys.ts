import type { DiffDto, HistoryEventDto, NotificationDto, QueryDto, RevisionSummaryDto } from '@ampwright/common';

export type { QueryDto, RevisionSummaryDto, DiffDto, HistoryEventDto, NotificationDto };

/** Every query key of this feature (a sheet's review lives under the sheet's key, so invalidating the sheet reaches it). */
export const reviewKeys = {
  queries: (sheetId: string) => ['sheets', sheetId, 'queries'] as const,
  revisions: (sheetId: string) => ['sheets', sheetId, 'revisions'] as const,
  history: (sheetId: string) => ['sheets', sheetId, 'history'] as const,
  diff: (sheetId: string, from: string, to: string) => ['sheets', sheetId, 'diff', from, to] as const,
  notifications: ['notifications'] as const,
};
