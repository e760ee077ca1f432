import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CellDto, SheetDto, SheetState, SheetSummaryDto, TemplateSummaryDto } from '@ampwright/common';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { projectKeys } from '../../projects';

export type { SheetState };
export const STATE_LABELS: Record<SheetState, string> = {
  'being-prepared': 'Being prepared',
  'with-checker': 'With the checker',
  checked: 'Checked',
  approved: 'Approved',
  issued: 'Issued',
};

export type SheetSummary = SheetSummaryDto;
export type CellView = CellDto;
export type SheetView = SheetDto;
export type TemplateSummary = TemplateSummaryDto;

export const sheetKeys = {
  ofProject: (projectId: string) => ['projects', projectId, 'sheets'] as const,
  one: (id: string) => ['sheets', id] as const,
  templates: ['templates'] as const,
};

export const useProjectSheets = (projectId: string) =>
  useQuery(
    queryOptions({ queryKey: sheetKeys.ofProject(projectId), queryFn: ({ signal }) => api.get<SheetSummary[]>(`/projects/${projectId}/sheets`, { signal }) }),
  );

export const sheetQueryOptions = (id: string) =>
  queryOptions({ queryKey: sheetKeys.one(id), queryFn: ({ signal }) => api.get<SheetView>(`/sheets/${id}`, { signal }) });
export const useSheet = (id: string) => useQuery(sheetQueryOptions(id));

export const useTemplates = () =>
  useQuery(queryOptions({ queryKey: sheetKeys.templates, queryFn: ({ signal }) => api.get<TemplateSummary[]>('/templates', { signal }), staleTime: 60_000 }));

export const newSheetSchema = z
  .object({
    number: z
      .string()
      .trim()
      .min(1, 'Enter a sheet number')
      .max(40, 'At most 40 characters')
      .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, 'Letters, digits and . _ / - only'),
    title: z.string().trim().max(200, 'At most 200 characters'),
    templateId: z.string(),
  })
  .refine((v) => v.templateId !== '' || v.title !== '', { message: 'A blank sheet needs a title', path: ['title'] });

export function useCreateSheet(projectId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: z.infer<typeof newSheetSchema>) =>
      api.post<SheetView>(`/projects/${projectId}/sheets`, {
        number: body.number,
        ...(body.title ? { title: body.title } : {}),
        ...(body.templateId ? { templateId: body.templateId } : {}),
      }),
    onSuccess: (sheet) => {
      queryClient.setQueryData(sheetKeys.one(sheet.id), sheet);
      void queryClient.invalidateQueries({ queryKey: sheetKeys.ofProject(projectId) });
      void queryClient.invalidateQueries({ queryKey: projectKeys.all });
    },
  });
}

export function useSaveAsTemplate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { sheetId: string; title?: string }) => api.post<TemplateSummary>('/templates', body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: sheetKeys.templates }),
  });
}
