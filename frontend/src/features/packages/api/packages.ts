import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CertificateDto, PackageStatusDto, PortalRevisionDto, VerdictDto, PackageSettingsDto } from '@ampwright/common';
import { api } from '../../../lib/api-client';

export type PackageStatus = PackageStatusDto;
export type PortalRevision = PortalRevisionDto;
export type Verdict = VerdictDto;
export type CertificateView = CertificateDto;

/** Every query key of this feature. */
export const packageKeys = {
  status: (revisionId: string) => ['revisions', revisionId, 'package'] as const,
  portal: ['portal'] as const,
  certificate: ['firm', 'certificate'] as const,
  settings: ['firm', 'package-settings'] as const,
};

/** A package's making, polled every second until it is done or failed. */
export const usePackageStatus = (revisionId: string) =>
  useQuery({
    queryKey: packageKeys.status(revisionId),
    queryFn: ({ signal }) => api.get<PackageStatus>(`/revisions/${revisionId}/package/status`, { signal }),
    refetchInterval: (q) => (q.state.data && (q.state.data.status === 'done' || q.state.data.status === 'failed') ? false : 1000),
  });

export function useRetryPackage(revisionId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<PackageStatus>(`/revisions/${revisionId}/package/retry`),
    onSuccess: (s) => qc.setQueryData(packageKeys.status(revisionId), s),
  });
}

export const usePortal = () => useQuery({ queryKey: packageKeys.portal, queryFn: ({ signal }) => api.get<PortalRevision[]>('/portal/revisions', { signal }) });

export function useVerify() {
  return useMutation({
    mutationFn: (file: File) => {
      const form = new FormData();
      form.set('file', file);
      return api.post<Verdict>('/verify', form);
    },
  });
}

export const useCertificate = () =>
  useQuery({ queryKey: packageKeys.certificate, queryFn: ({ signal }) => api.get<CertificateView | null>('/firm/certificate', { signal }) });

export const usePackageSettings = () =>
  useQuery({ queryKey: packageKeys.settings, queryFn: ({ signal }) => api.get<PackageSettingsDto>('/firm/package-settings', { signal }) });

export function useSetPackageSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: PackageSettingsDto) => api.put<PackageSettingsDto>('/firm/package-settings', body),
    onSuccess: (settings) => qc.setQueryData(packageKeys.settings, settings),
  });
}

export function useUploadCertificate() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ file, password }: { file: File; password: string }) => {
      const form = new FormData();
      form.set('password', password);
      form.set('file', file);
      return api.post<CertificateView>('/firm/certificate', form);
    },
    onSuccess: (c) => qc.setQueryData(packageKeys.certificate, c),
  });
}
