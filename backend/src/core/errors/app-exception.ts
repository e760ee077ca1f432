/**
 * The API's errors: one exception class per feature, each taking only codes of its feature's enum
 * (common/src/api/error-codes.ts, so the app tests codes by type), and the HTTP status of every code
 * chosen once, in the tables below (each a Record over its enum: a new code does not compile until it has
 * a status). The workflow's refusals carry their kind instead (conflict, forbidden, invalid; see
 * common/src/review/workflow.ts), and their status is chosen by that kind, also here. The filter
 * (core/filters/all-exceptions.filter.ts) gives every error the one shape `{ statusCode, code, message, details? }`.
 */
import { HttpStatus } from '@nestjs/common';
import {
  AuthErrorCode,
  ErrorCode,
  EvaluationErrorCode,
  InvitationErrorCode,
  MemberErrorCode,
  PackageErrorCode,
  ProjectErrorCode,
  SheetErrorCode,
  type Refusal,
  type WorkflowCode,
} from '@ampwright/common';

export { ErrorCode };

export interface ErrorDetail {
  field?: string;
  message: string;
}

/** The body of every error the API returns. */
export interface ErrorBody {
  statusCode: number;
  code: string;
  message: string;
  details?: ErrorDetail[];
  /** For a conflict: what the editor needs to merge (SheetContentsDto). */
  current?: unknown;
}

export interface ErrorExtras {
  details?: ErrorDetail[];
  /** For a conflict: the current state of what the caller tried to change. */
  current?: unknown;
  /** Response headers that go with the error (Retry-After). */
  headers?: Record<string, string>;
}

/** Every feature's error: a code, a sentence for the user, and what goes with it; `status` comes from the feature's table. */
export abstract class AppException<C extends string = string> extends Error {
  readonly details?: ErrorDetail[];
  readonly current?: unknown;
  readonly headers?: Record<string, string>;
  abstract readonly status: HttpStatus;

  constructor(
    readonly code: C,
    message: string,
    extras: ErrorExtras = {},
  ) {
    super(message);
    this.name = new.target.name;
    this.details = extras.details;
    this.current = extras.current;
    this.headers = extras.headers;
  }
}

/** A feature's exception class, whose status is its code's in the table given. */
function featureException<C extends string>(statuses: Record<C, HttpStatus>) {
  return class extends AppException<C> {
    get status(): HttpStatus {
      return statuses[this.code];
    }
  };
}

const {
  BAD_REQUEST,
  UNAUTHORIZED,
  FORBIDDEN,
  NOT_FOUND,
  CONFLICT,
  PAYLOAD_TOO_LARGE,
  UNSUPPORTED_MEDIA_TYPE,
  UNPROCESSABLE_ENTITY,
  TOO_MANY_REQUESTS,
  SERVICE_UNAVAILABLE,
} = HttpStatus;

/** Errors of the request itself, any feature: bad input, not signed in, not found, too many, … */
export class RequestException extends featureException<ErrorCode>({
  [ErrorCode.BadRequest]: BAD_REQUEST,
  [ErrorCode.ValidationFailed]: BAD_REQUEST,
  [ErrorCode.Unauthenticated]: UNAUTHORIZED,
  [ErrorCode.Forbidden]: FORBIDDEN,
  [ErrorCode.CsrfFailed]: FORBIDDEN,
  [ErrorCode.NotFound]: NOT_FOUND,
  [ErrorCode.Conflict]: CONFLICT,
  [ErrorCode.WriteConflict]: CONFLICT,
  [ErrorCode.PayloadTooLarge]: PAYLOAD_TOO_LARGE,
  [ErrorCode.UnsupportedMediaType]: UNSUPPORTED_MEDIA_TYPE,
  [ErrorCode.TooManyRequests]: TOO_MANY_REQUESTS,
  [ErrorCode.ServiceUnavailable]: SERVICE_UNAVAILABLE,
  [ErrorCode.Internal]: HttpStatus.INTERNAL_SERVER_ERROR,
}) {}

export class AuthException extends featureException<AuthErrorCode>({
  [AuthErrorCode.EmailTaken]: CONFLICT,
  [AuthErrorCode.BadCredentials]: UNAUTHORIZED,
  [AuthErrorCode.NoMembership]: FORBIDDEN,
  [AuthErrorCode.ResetInvalid]: BAD_REQUEST,
  [AuthErrorCode.RegistrationInvalid]: BAD_REQUEST,
}) {}

export class MemberException extends featureException<MemberErrorCode>({
  [MemberErrorCode.LastOwner]: CONFLICT,
  [MemberErrorCode.ClientWithOtherRoles]: BAD_REQUEST,
}) {}

export class InvitationException extends featureException<InvitationErrorCode>({
  [InvitationErrorCode.ClientWithOtherRoles]: BAD_REQUEST,
  [InvitationErrorCode.AlreadyMember]: CONFLICT,
  [InvitationErrorCode.Invalid]: BAD_REQUEST,
}) {}

export class ProjectException extends featureException<ProjectErrorCode>({
  [ProjectErrorCode.JobNumberTaken]: CONFLICT,
  [ProjectErrorCode.HasIssuedSheets]: CONFLICT,
}) {}

export class PackageException extends featureException<PackageErrorCode>({
  [PackageErrorCode.NotReady]: CONFLICT,
  [PackageErrorCode.CertificateRefused]: BAD_REQUEST,
}) {}

export class SheetException extends featureException<SheetErrorCode>({
  [SheetErrorCode.NumberTaken]: CONFLICT,
  [SheetErrorCode.StaleVersion]: CONFLICT,
  [SheetErrorCode.ReadOnly]: CONFLICT,
  [SheetErrorCode.BadCell]: BAD_REQUEST,
  [SheetErrorCode.NotIndependent]: BAD_REQUEST,
  [SheetErrorCode.NotPreparer]: FORBIDDEN,
  [SheetErrorCode.HasRevisions]: CONFLICT,
  [SheetErrorCode.CsvInvalid]: BAD_REQUEST,
}) {}

export class EvaluationException extends featureException<EvaluationErrorCode>({
  [EvaluationErrorCode.Timeout]: UNPROCESSABLE_ENTITY,
  [EvaluationErrorCode.TooLarge]: UNPROCESSABLE_ENTITY,
  [EvaluationErrorCode.Failed]: UNPROCESSABLE_ENTITY,
  [EvaluationErrorCode.Busy]: TOO_MANY_REQUESTS,
  [EvaluationErrorCode.Unavailable]: SERVICE_UNAVAILABLE,
}) {}

const REFUSAL_STATUS: Record<Refusal['kind'], HttpStatus> = { conflict: CONFLICT, forbidden: FORBIDDEN, invalid: BAD_REQUEST };

/** A refusal of the workflow rulebook: its status is its kind's (the sheet is not in a state for it, not this person, a bad choice). */
export class WorkflowException extends AppException<WorkflowCode> {
  readonly kind: Refusal['kind'];

  constructor(refusal: Refusal) {
    super(refusal.code, refusal.message, { details: refusal.details });
    this.kind = refusal.kind;
  }

  get status(): HttpStatus {
    return REFUSAL_STATUS[this.kind];
  }
}
