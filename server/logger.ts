import pino, { type Logger } from 'pino';
import { getConfig } from './config';

let instance: Logger | undefined;

/**
 * The process-wide pino logger. Level comes from LOG_LEVEL (default: info, silent under NODE_ENV=test).
 * Secrets that could reach a log line through a request or error object are redacted.
 */
export function getLogger(): Logger {
  if (!instance) {
    const config = getConfig();
    instance = pino({
      level: config.logLevel,
      base: { app: 'gantrywright' },
      redact: { paths: ['password', '*.password', 'token', '*.token', 'req.headers.cookie', 'headers.cookie'], censor: '[redacted]' },
    });
  }
  return instance;
}

/** Shorthand proxy so modules can `import { logger }` without calling getLogger() at import time. */
export const logger: Logger = new Proxy({} as Logger, {
  get(_target, prop) {
    const real = getLogger() as unknown as Record<string | symbol, unknown>;
    const value = real[prop];
    return typeof value === 'function' ? (value as (...a: unknown[]) => unknown).bind(real) : value;
  },
});
