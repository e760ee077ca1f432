import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { packageKeys, type PackageStatus } from './package-keys';

/** POST /api/revisions/:id/package/retry: makes a failed package again. */
export const retryPackage = (revisionId: string) => api.post<PackageStatus>(`/revisions/${revisionId}/package/retry`);

export function useRetryPackage(revisionId: string) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: () => retryPackage(revisionId), onSuccess: (s) => queryClient.setQueryData(packageKeys.status(revisionId), s) });
}
