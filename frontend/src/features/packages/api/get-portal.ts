import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { packageKeys, type PortalRevision } from './package-keys';

/** GET /api/portal/revisions: a client's issued revisions. */
export const getPortal = (signal?: AbortSignal) => api.get<PortalRevision[]>('/portal/revisions', { signal });

export const portalQueryOptions = () => queryOptions({ queryKey: packageKeys.portal, queryFn: ({ signal }) => getPortal(signal) });

export const usePortal = () => useQuery(portalQueryOptions());
