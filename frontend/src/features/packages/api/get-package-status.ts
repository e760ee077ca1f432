import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { packageKeys, type PackageStatus } from './package-keys';

/** GET /api/revisions/:id/package/status: how far the signed package of a revision is made. */
export const getPackageStatus = (revisionId: string, signal?: AbortSignal) => api.get<PackageStatus>(`/revisions/${revisionId}/package/status`, { signal });

/** Polled every second until the package is done or failed. */
export const packageStatusQueryOptions = (revisionId: string) =>
  queryOptions({
    queryKey: packageKeys.status(revisionId),
    queryFn: ({ signal }) => getPackageStatus(revisionId, signal),
    refetchInterval: (q) => (q.state.data && (q.state.data.status === 'done' || q.state.data.status === 'failed') ? false : 1000),
  });

export const usePackageStatus = (revisionId: string) => useQuery(packageStatusQueryOptions(revisionId));
