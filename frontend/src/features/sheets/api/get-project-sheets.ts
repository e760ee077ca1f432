import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sheetKeys, type SheetSummary } from './sheet-keys';

/** GET /api/projects/:id/sheets: a project's sheets with their state and open queries. */
export const getProjectSheets = (projectId: string, signal?: AbortSignal) => api.get<SheetSummary[]>(`/projects/${projectId}/sheets`, { signal });

export const projectSheetsQueryOptions = (projectId: string) =>
  queryOptions({ queryKey: sheetKeys.ofProject(projectId), queryFn: ({ signal }) => getProjectSheets(projectId, signal) });

export const useProjectSheets = (projectId: string) => useQuery(projectSheetsQueryOptions(projectId));
