import { ConsoleLogger } from '@nestjs/common';
import { currentRequestId } from './middleware/request-id';

/**
 * The app's log: one JSON object a line (time, level, context, message) for operators and log collectors, or
 * coloured text for a person at a terminal (LOG_FORMAT=text). A line written on behalf of a request — its
 * handler, its evaluation, the package job it queued, run later — carries the request's id (`requestId`).
 */
class AppLogger extends ConsoleLogger {
  protected override getJsonLogObject(message: unknown, options: Parameters<ConsoleLogger['getJsonLogObject']>[1]) {
    const line = super.getJsonLogObject(message, options);
    const requestId = currentRequestId();
    // A message that names its request already (the request line) is left as it is.
    return requestId && !(message && typeof message === 'object' && 'requestId' in message) ? { ...line, requestId } : line;
  }

  protected override formatContext(context: string): string {
    const requestId = currentRequestId();
    return super.formatContext(requestId && context ? `${context} ${requestId}` : context);
  }
}

export function createLogger(format = process.env.LOG_FORMAT ?? 'json'): ConsoleLogger {
  return format === 'text' ? new AppLogger() : new AppLogger({ json: true, colors: false });
}
