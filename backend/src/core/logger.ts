import { ConsoleLogger } from '@nestjs/common';

/**
 * The app's log: one JSON object a line (time, level, context, message, with the request id in request and
 * error lines) for operators and log collectors, or coloured text for a person at a terminal (LOG_FORMAT=text).
 */
export function createLogger(format = process.env.LOG_FORMAT ?? 'json'): ConsoleLogger {
  return format === 'text' ? new ConsoleLogger() : new ConsoleLogger({ json: true, colors: false });
}
