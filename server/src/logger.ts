import pino, { type Logger } from 'pino';
import type { Config } from './config';

/** Structured JSON logs on stdout (pino); `LOG_LEVEL=silent` in tests. */
export function createLogger(config: Pick<Config, 'LOG_LEVEL'>): Logger {
  return pino({
    level: config.LOG_LEVEL,
    base: { service: 'spincycle' },
    redact: { paths: ['req.headers.cookie', 'req.headers["x-xsrf-token"]', 'res.headers["set-cookie"]', '*.password'], censor: '[redacted]' },
  });
}
