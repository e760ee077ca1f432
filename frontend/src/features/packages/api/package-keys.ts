import type { CertificateDto, PackageStatusDto, PortalRevisionDto, VerdictDto } from '@ampwright/common';

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
