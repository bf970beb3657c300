import nodemailer, { type Transporter } from 'nodemailer';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { Logger } from '../logger.js';

export interface MailContent {
  to: string;
  subject: string;
  text: string;
  html: string;
}

const MAX_ATTEMPTS = 5;

/**
 * Outgoing mail through a queue table: a request only inserts a row (it never waits
 * for SMTP and never fails because of it); a background loop delivers with nodemailer,
 * retrying with growing pauses, and marks a mail failed after the last attempt.
 */
export class Mailer {
  private transport: Transporter;
  private timer: NodeJS.Timeout | undefined;
  private running: Promise<void> | undefined;

  constructor(
    private readonly sequelize: Sequelize,
    smtpUrl: string,
    private readonly logger: Logger,
    private readonly from = 'Sheetwise <no-reply@sheetwise.test>',
  ) {
    this.transport = nodemailer.createTransport(smtpUrl, { ignoreTLS: smtpUrl.startsWith('smtp://127.0.0.1') } as never);
  }

  /** Queues a mail (inside the caller's transaction when given) and nudges delivery. */
  async send(mail: MailContent, options: { transaction?: import('sequelize').Transaction } = {}): Promise<void> {
    await this.sequelize.query('INSERT INTO mail_messages (to_address, subject, text, html) VALUES ($1, $2, $3, $4)', {
      bind: [mail.to, mail.subject, mail.text, mail.html],
      type: QueryTypes.INSERT,
      transaction: options.transaction,
    });
    if (options.transaction) options.transaction.afterCommit(() => this.kick());
    else this.kick();
  }

  start(intervalMs = 2000): void {
    this.timer = setInterval(() => this.kick(), intervalMs);
    this.timer.unref();
  }

  async stop(): Promise<void> {
    clearInterval(this.timer);
    await this.running;
    this.transport.close();
  }

  /** Delivers what is due; one loop at a time. */
  kick(): void {
    if (this.running) return;
    this.running = this.deliverDue()
      .catch((err) => this.logger.warn({ err: err.message }, 'mail delivery loop failed'))
      .finally(() => {
        this.running = undefined;
      });
  }

  /** Waits until nothing is pending and due (tests use this). */
  async flush(): Promise<void> {
    for (let n = 0; n < 50; n++) {
      this.kick();
      await this.running;
      const [row] = await this.sequelize.query<{ n: string }>(
        "SELECT count(*) AS n FROM mail_messages WHERE status = 'pending' AND next_attempt_at <= now()",
        { type: QueryTypes.SELECT },
      );
      if (Number(row.n) === 0) return;
    }
  }

  private async deliverDue(): Promise<void> {
    for (;;) {
      const due = await this.sequelize.query<{ id: number; to_address: string; subject: string; text: string; html: string; attempts: number }>(
        `UPDATE mail_messages SET attempts = attempts + 1, next_attempt_at = now() + interval '1 minute'
         WHERE id IN (SELECT id FROM mail_messages WHERE status = 'pending' AND next_attempt_at <= now()
                      ORDER BY id LIMIT 10 FOR UPDATE SKIP LOCKED)
         RETURNING id, to_address, subject, text, html, attempts`,
        { type: QueryTypes.SELECT },
      );
      if (due.length === 0) return;
      for (const mail of due) {
        try {
          await this.transport.sendMail({ from: this.from, to: mail.to_address, subject: mail.subject, text: mail.text, html: mail.html });
          await this.sequelize.query("UPDATE mail_messages SET status = 'sent', sent_at = now(), last_error = NULL WHERE id = $1", { bind: [mail.id] });
        } catch (err) {
          const message = err instanceof Error ? err.message : String(err);
          const failed = mail.attempts >= MAX_ATTEMPTS;
          // Pauses of 2, 4, 8, 16 seconds between attempts.
          await this.sequelize.query(
            `UPDATE mail_messages SET last_error = $2, status = $3, next_attempt_at = now() + make_interval(secs => $4) WHERE id = $1`,
            { bind: [mail.id, message, failed ? 'failed' : 'pending', 2 ** mail.attempts] },
          );
          this.logger.warn({ to: mail.to_address, attempt: mail.attempts, err: message }, 'mail not delivered');
        }
      }
    }
  }
}
