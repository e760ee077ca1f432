import type { ProjectDto, ProjectPeopleDto } from '@ampwright/common';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';

export type Project = ProjectDto;

export const projectKeys = {
  all: ['projects'] as const,
  one: (id: string) => ['projects', id] as const,
  people: (id: string) => ['projects', id, 'people'] as const,
};

export const projectsQueryOptions = () => queryOptions({ queryKey: projectKeys.all, queryFn: ({ signal }) => api.get<Project[]>('/projects', { signal }) });
export const useProjects = () => useQuery(projectsQueryOptions());

export const projectQueryOptions = (id: string) =>
  queryOptions({ queryKey: projectKeys.one(id), queryFn: ({ signal }) => api.get<Project>(`/projects/${id}`, { signal }) });
export const useProject = (id: string) => useQuery(projectQueryOptions(id));

const text = (what: string, max: number) => z.string().trim().min(1, `Enter the ${what}`).max(max, `At most ${max} characters`);
export const projectSchema = z.object({
  jobNumber: text('job number', 40).regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, 'Letters, digits and . _ / - only'),
  title: text('title', 200),
  clientOrganisation: text('client organisation', 200),
  site: text('site', 200),
});

export function useCreateProject() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: z.infer<typeof projectSchema>) => api.post<Project>('/projects', body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: projectKeys.all }),
  });
}

export const useProjectPeople = (id: string) =>
  useQuery(queryOptions({ queryKey: projectKeys.people(id), queryFn: ({ signal }) => api.get<ProjectPeopleDto>(`/projects/${id}/people`, { signal }) }));

export function useSetProjectMembers(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (userIds: string[]) => api.put<ProjectPeopleDto>(`/projects/${id}/members`, { userIds }),
    onSuccess: (people) => queryClient.setQueryData([...projectKeys.one(id), 'people'], people),
  });
}
