import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AttachmentDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { sheetKeys } from './sheet-keys';

export type Attachment = AttachmentDto;

/** GET /api/sheets/:id/attachments. */
export const getAttachments = (sheetId: string, signal?: AbortSignal) => api.get<Attachment[]>(`/sheets/${sheetId}/attachments`, { signal });

export const attachmentsQueryOptions = (sheetId: string) =>
  queryOptions({ queryKey: sheetKeys.attachments(sheetId), queryFn: ({ signal }) => getAttachments(sheetId, signal) });

export const useAttachments = (sheetId: string) => useQuery(attachmentsQueryOptions(sheetId));
