import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { projectKeys, type Project } from './project-keys';

/** GET /api/projects: the projects the person may see. */
export const getProjects = (signal?: AbortSignal) => api.get<Project[]>('/projects', { signal });

export const projectsQueryOptions = () => queryOptions({ queryKey: projectKeys.all, queryFn: ({ signal }) => getProjects(signal) });

export const useProjects = () => useQuery(projectsQueryOptions());
