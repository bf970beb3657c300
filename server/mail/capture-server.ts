import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Sequelize } from 'sequelize';
import { QueryTypes } from 'sequelize';

/**
 * The local fake SMTP server of development and tests: it accepts every message on
 * 127.0.0.1 and stores it, parsed, in the captured_mail table (the admin's Outbox).
 * STARTTLS is off: smtp-server's built-in certificate has expired.
 */
export async function startCaptureServer(sequelize: Sequelize, port = 0): Promise<{ port: number; close: () => Promise<void> }> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 5 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (mail) => {
          const to = session.envelope.rcptTo.map((r) => r.address).join(', ');
          await sequelize.query(
            'INSERT INTO captured_mail (from_address, to_address, subject, text, html) VALUES ($1, $2, $3, $4, $5)',
            {
              bind: [session.envelope.mailFrom ? session.envelope.mailFrom.address : null, to, mail.subject ?? '', mail.text ?? '', mail.html || ''],
              type: QueryTypes.INSERT,
            },
          );
          callback();
        })
        .catch((err) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  return {
    port: typeof address === 'object' && address ? address.port : port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
