import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { projectKeys } from '../../projects';
import { sheetKeys, type SheetView } from './sheet-keys';

/** The new-sheet form's schema. */
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

/** POST /api/projects/:id/sheets: a blank sheet, or one from a template. */
export const createSheet = (projectId: string, body: z.infer<typeof newSheetSchema>) =>
  api.post<SheetView>(`/projects/${projectId}/sheets`, {
    number: body.number,
    ...(body.title ? { title: body.title } : {}),
    ...(body.templateId ? { templateId: body.templateId } : {}),
  });

export function useCreateSheet(projectId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: z.infer<typeof newSheetSchema>) => createSheet(projectId, body),
    onSuccess: (sheet) => {
      queryClient.setQueryData(sheetKeys.one(sheet.id), sheet);
      void queryClient.invalidateQueries({ queryKey: sheetKeys.ofProject(projectId) });
      void queryClient.invalidateQueries({ queryKey: projectKeys.all });
    },
  });
}
