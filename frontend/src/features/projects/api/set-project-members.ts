import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ProjectPeopleDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';
import { projectKeys } from './project-keys';

/** PUT /api/projects/:id/members: the project's team (replaces the list). */
export const setProjectMembers = (id: string, userIds: string[]) => api.put<ProjectPeopleDto>(`/projects/${id}/members`, { userIds });

export function useSetProjectMembers(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (userIds: string[]) => setProjectMembers(id, userIds),
    onSuccess: (people) => queryClient.setQueryData(projectKeys.people(id), people),
  });
}
