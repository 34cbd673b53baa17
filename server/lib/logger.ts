import { pino, type Logger } from 'pino';

export type { Logger };

/** JSON lines on stdout; secrets in request headers and bodies are redacted. */
export function createLogger(level: string = process.env.LOG_LEVEL ?? 'info'): Logger {
  return pino({
    level,
    base: { app: 'fringewalk' },
    redact: {
      paths: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]', '*.password', '*.token'],
      censor: '[redacted]',
    },
  });
}
