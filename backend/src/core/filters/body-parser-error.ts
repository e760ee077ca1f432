import { ErrorCode, RequestException } from '../errors/app-exception';

const BY_TYPE: Record<string, [ErrorCode, string]> = {
  'entity.too.large': [ErrorCode.PayloadTooLarge, 'The request body is larger than this endpoint accepts.'],
  'entity.parse.failed': [ErrorCode.BadRequest, 'The request body is not valid JSON.'],
  'encoding.unsupported': [ErrorCode.UnsupportedMediaType, 'The request body has an unsupported encoding.'],
  'charset.unsupported': [ErrorCode.UnsupportedMediaType, 'The request body has an unsupported character set.'],
  'request.aborted': [ErrorCode.BadRequest, 'The request was aborted before its body arrived.'],
};

/** Maps an error thrown by Express's body parser (it carries `type` and `status`) to our exception. */
export function bodyParserError(err: unknown): RequestException | undefined {
  const e = err as { type?: unknown; status?: unknown } | null;
  if (!e || typeof e.type !== 'string' || typeof e.status !== 'number' || e.status < 400 || e.status >= 500) return undefined;
  const [code, message] = BY_TYPE[e.type] ?? [ErrorCode.BadRequest, 'The request body could not be read.'];
  return new RequestException(code, message);
}
