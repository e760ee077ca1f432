/** Bodies of the packages, portal, verification and certificate API, shared by server and app. */
import type { RevisionSummaryDto } from './review';

export interface PackageStatusDto {
  status: 'queued' | 'running' | 'done' | 'failed' | 'none';
  percent: number;
  error: string | null;
  pdfSha256: string | null;
}

export interface PortalRevisionDto extends RevisionSummaryDto {
  sheetId: string;
  sheetNumber: string;
  sheetTitle: string;
  projectId: string;
  jobNumber: string;
  projectTitle: string;
  packageReady: boolean;
}

export type VerdictDto =
  | { verdict: 'unaltered'; project: string; jobNumber: string; sheet: string; sheetTitle: string; revision: string; issuedAt: string; firm: string }
  | { verdict: 'altered' | 'unknown'; message: string };

export interface CertificateDto {
  subject: string;
  issuer: string;
  notBefore: string;
  notAfter: string;
  fingerprint: string;
  selfSigned: boolean;
}

/** GET/PUT /api/firm/package-settings: whether the firm's packages carry its internal query register (off by default). */
export interface PackageSettingsDto {
  queryRegister: boolean;
}
