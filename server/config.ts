import { availableParallelism } from 'node:os';

/** Server configuration, read once from the environment. */
export interface ServerConfig {
  port: number;
  host: string;
  databaseUrl: string;
  sessionSecret: string;
  /** Folder with the built Angular client; served when it exists. */
  clientDir: string;
  /** Per-statement evaluation time limit. */
  statementTimeLimitMs: number;
  evaluationWorkers: number;
  /** Heap limit of each evaluation worker. */
  evaluationWorkerMemoryMb: number;
  /** `secure` cookies only behind HTTPS. */
  secureCookies: boolean;
  logLevel: string;
  /** Free failed sign-ins per account and client address before the back-off starts (twice that per client address across accounts; see auth/throttle.ts). */
  loginRateLimit: number;
  /** The address people reach the product at; links in mail point there. */
  publicUrl: string;
  /** Room for attached files per group, in bytes (ATTACHMENT_QUOTA_MB, default 200). */
  attachmentQuotaBytes: number;
}

/** ATTACHMENT_QUOTA_MB as bytes: the attached files of one group together stay within it. */
export const attachmentQuotaBytes = (env: NodeJS.ProcessEnv = process.env) => Math.round(Number(env['ATTACHMENT_QUOTA_MB'] ?? 200) * 1024 * 1024);

export function loadConfig(env: NodeJS.ProcessEnv = process.env): ServerConfig {
  const databaseUrl = env['DATABASE_URL'];
  if (!databaseUrl) throw new Error('DATABASE_URL is not set. Start the product with `npm start`.');
  return {
    port: Number(env['PORT'] ?? 4300),
    host: env['HOST'] ?? '127.0.0.1',
    databaseUrl,
    sessionSecret: env['SESSION_SECRET'] ?? 'sheetwise-development-secret-change-me',
    clientDir: env['CLIENT_DIR'] ?? 'dist/sheetwise/browser',
    statementTimeLimitMs: Number(env['STATEMENT_TIME_LIMIT_MS'] ?? 5000),
    // One core stays with the event loop, so lists and saves stay quick while worksheets evaluate.
    evaluationWorkers: Number(env['EVALUATION_WORKERS'] ?? Math.max(1, availableParallelism() - 1)),
    evaluationWorkerMemoryMb: Number(env['EVALUATION_WORKER_MEMORY_MB'] ?? 512),
    secureCookies: env['SECURE_COOKIES'] === '1',
    logLevel: env['LOG_LEVEL'] ?? 'info',
    loginRateLimit: Number(env['LOGIN_RATE_LIMIT'] ?? 20),
    publicUrl: (env['PUBLIC_URL'] ?? `http://127.0.0.1:${env['PORT'] ?? 4300}`).replace(/\/$/, ''),
    attachmentQuotaBytes: attachmentQuotaBytes(env),
  };
}
