import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sheetKeys, type TemplateSummary } from './sheet-keys';

/** GET /api/templates: the built-in templates and the firm's own. */
export const getTemplates = (signal?: AbortSignal) => api.get<TemplateSummary[]>('/templates', { signal });

export const templatesQueryOptions = () => queryOptions({ queryKey: sheetKeys.templates, queryFn: ({ signal }) => getTemplates(signal), staleTime: 60_000 });

export const useTemplates = () => useQuery(templatesQueryOptions());
