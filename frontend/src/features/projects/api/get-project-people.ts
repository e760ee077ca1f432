import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProjectPeopleDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { projectKeys } from './project-keys';

/** GET /api/projects/:id/people: the project's team and its invited clients. */
export const getProjectPeople = (id: string, signal?: AbortSignal) => api.get<ProjectPeopleDto>(`/projects/${id}/people`, { signal });

export const projectPeopleQueryOptions = (id: string) =>
  queryOptions({ queryKey: projectKeys.people(id), queryFn: ({ signal }) => getProjectPeople(id, signal) });

export const useProjectPeople = (id: string) => useQuery(projectPeopleQueryOptions(id));
