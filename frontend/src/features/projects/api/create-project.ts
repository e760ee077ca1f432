import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { projectKeys, type Project } from './project-keys';

const text = (what: string, max: number) => z.string().trim().min(1, `Enter the ${what}`).max(max, `At most ${max} characters`);

/** The new-project form's schema, the body of POST /api/projects. */
export const projectSchema = z.object({
  jobNumber: text('job number', 40).regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, 'Letters, digits and . _ / - only'),
  title: text('title', 200),
  clientOrganisation: text('client organisation', 200),
  site: text('site', 200),
});

export const createProject = (body: z.infer<typeof projectSchema>) => api.post<Project>('/projects', body);

export function useCreateProject() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createProject, onSuccess: () => queryClient.invalidateQueries({ queryKey: projectKeys.all }) });
}
