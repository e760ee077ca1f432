/** Bodies of the checking and revisions API. */
import type { CellDiff } from '../review/diff';

export type QueryStatus = 'open' | 'answered' | 'closed';

export interface QueryMessageDto {
  id: string;
  author: string;
  authorId: string;
  text: string;
  createdAt: string;
}

export interface QueryDto {
  id: string;
  cellId: string | null;
  /** The line of a calc cell the query is about, from 1; null for the whole cell. */
  line: number | null;
  status: QueryStatus;
  raisedBy: string;
  /** The revision being prepared when it was raised (1 for the first, A). */
  revisionNumber: number;
  messages: QueryMessageDto[];
  closedBy: string | null;
  closedAt: string | null;
  createdAt: string;
}

export interface RevisionSummaryDto {
  id: string;
  code: string;
  number: number;
  snapshotSha256: string;
  pdfSha256: string | null;
  engineVersion: string;
  preparedBy: string;
  checkedBy: string;
  approvedBy: string;
  checkRequestedAt: string | null;
  checkedAt: string | null;
  approvedAt: string | null;
  issuedAt: string;
}

export interface DiffDto {
  from: string;
  to: string;
  cells: CellDiff[];
}

export interface HistoryEventDto {
  id: string;
  type: string;
  who: string | null;
  detail: Record<string, unknown> | null;
  createdAt: string;
}

export interface NotificationDto {
  id: string;
  kind: string;
  text: string;
  link: string;
  readAt: string | null;
  createdAt: string;
}
