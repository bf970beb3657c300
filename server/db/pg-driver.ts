// The pg driver as Sequelize should load it: the same module, except that every
// Client listens for 'error' from the moment it exists.
//
// Why: Sequelize attaches its own error listener only after `connect()` resolves, one
// microtask after pg's ready message. When the database shuts down just as a
// connection opens, PostgreSQL's "terminating connection" message can arrive in the
// same network chunk as the ready message; pg then emits 'error' before Sequelize is
// listening, and an 'error' with no listener ends the process. Seen in the
// database-restart test. The early listener only has to exist: the dead connection
// fails its first query, Sequelize discards it, and the request gets a 503.
import pg from 'pg';

class ListeningClient extends pg.Client {
  constructor(config?: string | pg.ClientConfig) {
    super(config);
    this.on('error', () => {});
  }
}

export const pgDriver = { ...pg, Client: ListeningClient };
