import { HttpStatus } from '@nestjs/common';

/** Codes of the single JSON error shape; features add theirs here so clients can rely on them. */
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
}

export interface ErrorDetail {
  field?: string;
  message: string;
}

/** The body of every error the API returns. */
export interface ErrorBody {
  statusCode: number;
  code: ErrorCode | string;
  message: string;
  details?: ErrorDetail[];
  /** For a conflict: the current state of what the caller tried to change. */
  current?: unknown;
}

/** A feature's error: a code, a sentence for the user, and the HTTP status it maps to. */
export class AppException extends Error {
  constructor(
    readonly code: ErrorCode | string,
    message: string,
    readonly status: HttpStatus = HttpStatus.BAD_REQUEST,
    readonly details?: ErrorDetail[],
    readonly current?: unknown,
    /** Response headers that go with the error (Retry-After). */
    readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}
