import { startServer, type RunningServer } from '../../server/main.js';
import { createTestDatabase } from './test-database.js';

export interface TestServer {
  url: string;
  databaseUrl: string;
  running: RunningServer;
  stop: () => Promise<void>;
}

/** A real server on an ephemeral loopback port over a fresh, migrated and seeded database. */
export async function startTestServer(env: Record<string, string> = {}): Promise<TestServer> {
  const db = await createTestDatabase();
  const running = await startServer({
    ...process.env,
    PORT: '0',
    DATABASE_URL: db.url,
    SHEETWISE_SEED_DEMO: '1',
    LOG_LEVEL: 'silent',
    EVALUATION_WORKERS: '1',
    ...env,
  });
  return {
    url: running.url,
    databaseUrl: db.url,
    running,
    stop: async () => {
      await running.stop();
      await db.drop();
    },
  };
}
