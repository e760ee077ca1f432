import { ValidationError, ValidationPipe } from '@nestjs/common';
import { ErrorCode, ErrorDetail, RequestException } from './errors/app-exception';

function flatten(errors: ValidationError[], prefix = ''): ErrorDetail[] {
  return errors.flatMap((e) => {
    const field = prefix ? `${prefix}.${e.property}` : e.property;
    const own = Object.values(e.constraints ?? {}).map((message) => ({ field, message }));
    return [...own, ...flatten(e.children ?? [], field)];
  });
}

/** The global pipe: unknown fields are refused, values transformed to their DTO types, errors listed per field. */
export function createValidationPipe(): ValidationPipe {
  return new ValidationPipe({
    whitelist: true,
    forbidNonWhitelisted: true,
    transform: true,
    exceptionFactory: (errors) => {
      const details = flatten(errors);
      return new RequestException(ErrorCode.ValidationFailed, details.map((d) => d.message).join('; ') || 'The request is not valid.', { details });
    },
  });
}
