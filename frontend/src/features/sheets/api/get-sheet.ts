import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sheetKeys, type SheetView } from './sheet-keys';

/** GET /api/sheets/:id: a sheet with its cells and their stored results. */
export const getSheet = (id: string, signal?: AbortSignal) => api.get<SheetView>(`/sheets/${id}`, { signal });

export const sheetQueryOptions = (id: string) => queryOptions({ queryKey: sheetKeys.one(id), queryFn: ({ signal }) => getSheet(id, signal) });

export const useSheet = (id: string) => useQuery(sheetQueryOptions(id));
