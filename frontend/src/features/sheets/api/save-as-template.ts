import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sheetKeys, type TemplateSummary } from './sheet-keys';

/** POST /api/templates: a sheet kept as one of the firm's templates. */
export const saveAsTemplate = (body: { sheetId: string; title?: string }) => api.post<TemplateSummary>('/templates', body);

export function useSaveAsTemplate() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: saveAsTemplate, onSuccess: () => queryClient.invalidateQueries({ queryKey: sheetKeys.templates }) });
}
