import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { packageKeys, type CertificateView } from './package-keys';

/** POST /api/firm/certificate: the firm's PKCS#12 file and its password. */
export function uploadCertificate({ file, password }: { file: File; password: string }) {
  const form = new FormData();
  form.set('password', password);
  form.set('file', file);
  return api.post<CertificateView>('/firm/certificate', form);
}

export function useUploadCertificate() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: uploadCertificate, onSuccess: (c) => queryClient.setQueryData(packageKeys.certificate, c) });
}
