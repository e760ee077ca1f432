import { HttpStatus } from '@nestjs/common';
import { ErrorCode } from '@ampwright/common';

/** Codes of the single JSON error shape; features add theirs here so clients can rely on them. */
export { ErrorCode };

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
