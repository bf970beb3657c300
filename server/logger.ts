import { pino } from 'pino';

/** One logger for the server; passwords and cookies are redacted wherever they appear. */
export function createLogger(level: string) {
  return pino({
    level,
    redact: {
      paths: ['req.headers.cookie', 'req.headers["x-xsrf-token"]', 'res.headers["set-cookie"]', '*.password', 'password'],
      censor: '[redacted]',
    },
  });
}
export type Logger = ReturnType<typeof createLogger>;
