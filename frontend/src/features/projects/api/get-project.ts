import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { projectKeys, type Project } from './project-keys';

/** GET /api/projects/:id. */
export const getProject = (id: string, signal?: AbortSignal) => api.get<Project>(`/projects/${id}`, { signal });

export const projectQueryOptions = (id: string) => queryOptions({ queryKey: projectKeys.one(id), queryFn: ({ signal }) => getProject(id, signal) });

export const useProject = (id: string) => useQuery(projectQueryOptions(id));
