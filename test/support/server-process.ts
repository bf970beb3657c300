// The real server in a child process, as `npm start` runs it: a crash shows up as the
// process exiting, which an in-process server could not show.
import { spawn, type ChildProcess } from 'node:child_process';

export interface ServerProcess {
  child: ChildProcess;
  url: string;
  /** Set when the process ended on its own (a crash), with its exit code or signal. */
  exited: () => string | null;
  /** SIGTERM, then waits for the exit; resolves with the exit code. */
  stop: () => Promise<number | null>;
}

const running = new Set<ChildProcess>();
/** Kills whatever a test file left running (call from `after`). */
export function killServerProcesses(): void {
  for (const c of running) c.kill('SIGKILL');
  running.clear();
}

export function randomPort(): number {
  return 20000 + Math.floor(Math.random() * 20000);
}

export function startServerProcess(databaseUrl: string, port = randomPort(), env: Record<string, string> = {}): Promise<ServerProcess> {
  const child = spawn('node_modules/.bin/tsx', ['server/main.ts'], {
    env: { ...process.env, DATABASE_URL: databaseUrl, PORT: String(port), SHEETWISE_SEED_DEMO: '1', LOG_LEVEL: process.env['DEBUG_SERVER'] ? 'error' : 'silent', ...env },
    stdio: ['ignore', process.env['DEBUG_SERVER'] ? 'inherit' : 'ignore', 'inherit', 'ipc'],
  });
  running.add(child);
  let exit: string | null = null;
  let stopping = false;
  child.on('exit', (code, signal) => {
    running.delete(child);
    if (!stopping) exit = `exited with ${code ?? signal}`;
  });
  return new Promise((resolve, reject) => {
    child.on('message', (m: { type?: string }) => {
      if (m?.type !== 'ready') return;
      resolve({
        child,
        url: `http://127.0.0.1:${port}`,
        exited: () => exit,
        stop: () =>
          new Promise((done) => {
            stopping = true;
            if (child.exitCode !== null) return done(child.exitCode);
            child.once('exit', (code) => done(code));
            child.kill('SIGTERM');
          }),
      });
    });
    child.once('exit', (code) => reject(new Error(`the server exited with ${code} before it was ready`)));
  });
}
