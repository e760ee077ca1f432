import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ApiError, CSRF_HEADER, csrfHeaderValue } from '../../../lib/api-client';
import type { Attachment } from './get-attachments';
import { sheetKeys } from './sheet-keys';

/**
 * An upload with its progress: fetch cannot report upload progress, so this one request goes
 * through XMLHttpRequest, with the same cookie, anti-forgery header and error shape as the rest.
 */
export function uploadWithProgress(path: string, file: File, onProgress: (fraction: number) => void): Promise<Attachment> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api${path}`);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.setRequestHeader(CSRF_HEADER, csrfHeaderValue());
    xhr.upload.onprogress = (e) => e.lengthComputable && onProgress(e.loaded / e.total);
    xhr.onerror = () => reject(new ApiError(0, 'NETWORK', 'The server could not be reached. Check your connection and try again.'));
    xhr.onload = () => {
      let body: { code?: string; message?: string; details?: [] } = {};
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        /* not JSON */
      }
      if (xhr.status >= 200 && xhr.status < 300) resolve(body as unknown as Attachment);
      else reject(new ApiError(xhr.status, body.code ?? 'HTTP_ERROR', body.message ?? `The server answered ${xhr.status}.`, body.details ?? [], body));
    };
    const form = new FormData();
    form.set('file', file);
    xhr.send(form);
  });
}

/** POST /api/sheets/:id/attachments, with its progress. */
export function useUploadAttachment(sheetId: string, onProgress: (fraction: number) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (file: File) => uploadWithProgress(`/sheets/${sheetId}/attachments`, file, onProgress),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: sheetKeys.attachments(sheetId) }),
  });
}
