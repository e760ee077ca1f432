import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { packageKeys, type CertificateView } from './package-keys';

/** GET /api/firm/certificate: the firm's signing certificate, if one was uploaded. */
export const getCertificate = (signal?: AbortSignal) => api.get<CertificateView | null>('/firm/certificate', { signal });

export const certificateQueryOptions = () => queryOptions({ queryKey: packageKeys.certificate, queryFn: ({ signal }) => getCertificate(signal) });

export const useCertificate = () => useQuery(certificateQueryOptions());
