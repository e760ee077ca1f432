import type { ProjectDto } from '@ampwright/common';

export type Project = ProjectDto;

/** Every query key of this feature. */
export const projectKeys = {
  all: ['projects'] as const,
  one: (id: string) => ['projects', id] as const,
  people: (id: string) => ['projects', id, 'people'] as const,
};
