import pino, { type Logger } from 'pino'
import type { Env } from './env.ts'

export function createLogger(env: Pick<Env, 'LOG_LEVEL' | 'NODE_ENV'>): Logger {
  return pino({
    level: env.LOG_LEVEL,
    // Never write credentials or session cookies to the log.
    redact: {
      paths: [
        'req.headers.cookie',
        'req.headers.authorization',
        'res.headers["set-cookie"]',
        '*.password',
      ],
      censor: '[redacted]',
    },
  })
}
