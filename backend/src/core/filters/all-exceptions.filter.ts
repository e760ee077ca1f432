import { ArgumentsHost, Catch, ExceptionFilter, HttpException, HttpStatus, Logger } from '@nestjs/common';
import type { Request, Response } from 'express';
import { requestIdOf } from '../middleware/request-id';
import { AppException, ErrorBody, ErrorCode, RequestException } from '../errors/app-exception';
import { bodyParserError } from './body-parser-error';
import { MULTIPART_LIMIT_WORDS } from '../../files/uploads';
import { isWriteConflict } from '../../database/write-conflict';

const CODE_BY_STATUS: Record<number, ErrorCode> = {
  400: ErrorCode.BadRequest,
  401: ErrorCode.Unauthenticated,
  403: ErrorCode.Forbidden,
  404: ErrorCode.NotFound,
  409: ErrorCode.Conflict,
  413: ErrorCode.PayloadTooLarge,
  415: ErrorCode.UnsupportedMediaType,
  429: ErrorCode.TooManyRequests,
  503: ErrorCode.ServiceUnavailable,
};

/** Turns every error into the one JSON shape (ErrorBody). Unknown errors are logged, never shown. */
@Catch()
export class AllExceptionsFilter implements ExceptionFilter {
  private readonly logger = new Logger('Errors');

  catch(exception: unknown, host: ArgumentsHost): void {
    const response = host.switchToHttp().getResponse<Response>();
    const body = this.toBody(exception);
    if (body.statusCode >= 500) {
      const requestId = requestIdOf(host.switchToHttp().getRequest<Request>());
      this.logger.error({ requestId, error: exception instanceof Error ? (exception.stack ?? exception.message) : String(exception) });
    }
    if (exception instanceof AppException && exception.headers) for (const [name, value] of Object.entries(exception.headers)) response.setHeader(name, value);
    response.status(body.statusCode).json(body);
  }

  toBody(exception: unknown): ErrorBody {
    if (exception instanceof AppException) {
      return {
        statusCode: exception.status,
        code: exception.code,
        message: exception.message,
        ...(exception.details ? { details: exception.details } : {}),
        ...(exception.current !== undefined ? { current: exception.current } : {}),
      };
    }
    if (exception instanceof HttpException) {
      const status = exception.getStatus();
      const res = exception.getResponse();
      let message = typeof res === 'string' ? res : ((res as { message?: unknown }).message ?? exception.message);
      // Multer's words for an upload outside its limits.
      // (Multer appends " - field" to some.)
      const multer = typeof message === 'string' ? MULTIPART_LIMIT_WORDS[message.replace(/ - [^ ]*$/, '')] : undefined;
      if (multer) message = multer;
      return {
        statusCode: status,
        code: CODE_BY_STATUS[status] ?? (status >= 500 ? ErrorCode.Internal : ErrorCode.BadRequest),
        message: Array.isArray(message) ? message.join('; ') : String(message),
      };
    }
    if (isWriteConflict(exception)) {
      return this.toBody(
        new RequestException(
          ErrorCode.WriteConflict,
          'Another change was being written to the same records at the same moment, so this one was not stored. Try it again.',
        ),
      );
    }
    const parserError = bodyParserError(exception);
    if (parserError) return this.toBody(parserError);
    return { statusCode: HttpStatus.INTERNAL_SERVER_ERROR, code: ErrorCode.Internal, message: 'Something went wrong on the server. It has been logged.' };
  }
}
