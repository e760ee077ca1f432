/**
 * Every error code the API answers with, by feature: the server throws them, the app tests them by
 * type. Each feature has its exception class on the server, and each code its one HTTP status there
 * (backend core/errors/app-exception.ts); the filter gives every error the shape `{ statusCode, code, message, details? }`.
 * The review workflow's codes are `WorkflowCode` (review/workflow.ts).
 */
import { WorkflowCode } from '../review/workflow';

export enum ErrorCode {
  BadRequest = 'BAD_REQUEST',
  ValidationFailed = 'VALIDATION_FAILED',
  Unauthenticated = 'UNAUTHENTICATED',
  Forbidden = 'FORBIDDEN',
  NotFound = 'NOT_FOUND',
  Conflict = 'CONFLICT',
  PayloadTooLarge = 'PAYLOAD_TOO_LARGE',
  UnsupportedMediaType = 'UNSUPPORTED_MEDIA_TYPE',
  TooManyRequests = 'TOO_MANY_REQUESTS',
  ServiceUnavailable = 'SERVICE_UNAVAILABLE',
  Internal = 'INTERNAL_ERROR',
  /** A state-changing request without the anti-forgery header or token. */
  CsrfFailed = 'CSRF_FAILED',
  /**
   * The database aborted the change because another was written to the same rows at the same moment (a
   * deadlock on one server; a certification failure on a Galera cluster): nothing was stored; try again.
   */
  WriteConflict = 'WRITE_CONFLICT',
}

export enum AuthErrorCode {
  EmailTaken = 'EMAIL_TAKEN',
  BadCredentials = 'BAD_CREDENTIALS',
  NoMembership = 'NO_MEMBERSHIP',
  ResetInvalid = 'RESET_INVALID',
  RegistrationInvalid = 'REGISTRATION_INVALID',
}

export enum MemberErrorCode {
  LastOwner = 'LAST_OWNER',
  ClientWithOtherRoles = 'CLIENT_WITH_OTHER_ROLES',
}

export enum InvitationErrorCode {
  ClientWithOtherRoles = MemberErrorCode.ClientWithOtherRoles,
  AlreadyMember = 'ALREADY_MEMBER',
  Invalid = 'INVITATION_INVALID',
}

export enum ProjectErrorCode {
  JobNumberTaken = 'JOB_NUMBER_TAKEN',
  HasIssuedSheets = 'PROJECT_HAS_ISSUED_SHEETS',
}

export enum PackageErrorCode {
  NotReady = 'PACKAGE_NOT_READY',
  CertificateRefused = 'CERTIFICATE_REFUSED',
}

export enum SheetErrorCode {
  NumberTaken = 'SHEET_NUMBER_TAKEN',
  StaleVersion = 'STALE_VERSION',
  // The workflow rulebook's codes, where a sheet's rules and the workflow's meet.
  ReadOnly = WorkflowCode.ReadOnly,
  BadCell = 'INVALID_CELL',
  NotIndependent = WorkflowCode.NotIndependent,
  NotPreparer = WorkflowCode.NotPreparer,
  HasRevisions = 'SHEET_HAS_REVISIONS',
  CsvInvalid = 'CSV_INVALID',
}

export enum EvaluationErrorCode {
  Timeout = 'EVALUATION_TIMEOUT',
  TooLarge = 'EVALUATION_TOO_LARGE',
  Failed = 'EVALUATION_FAILED',
  Busy = 'EVALUATION_BUSY',
  /** The server is stopping; another instance (or this one, restarted) will do it. */
  Unavailable = 'EVALUATION_UNAVAILABLE',
}
