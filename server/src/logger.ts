import pino, { type DestinationStream, type Logger } from 'pino';
import type { Config } from './config';

/**
 * Structured JSON logs on stdout (pino); `LOG_LEVEL=silent` in tests, which may pass their own
 * `destination` to read the lines. Request lines carry no headers (http/request-logger.ts); the
 * redaction below is the safety net for anything else that logs a request or a password.
 */
export function createLogger(config: Pick<Config, 'LOG_LEVEL'>, destination?: DestinationStream): Logger {
  const options = {
    level: config.LOG_LEVEL,
    base: { service: 'spincycle' },
    redact: {
      paths: ['req.headers.cookie', 'req.headers["x-xsrf-token"]', 'res.headers["set-cookie"]', '*.password', '*.token'],
      censor: '[redacted]',
    },
  };
  return destination ? pino(options, destination) : pino(options);
}
