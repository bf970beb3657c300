/** Queries of the mail tables for the admin: what the fake SMTP server caught, and delivery state. */
import { QueryTypes } from 'sequelize';
import type { MailDeliveryDto, OutboxMessageDto } from '../../shared/collaboration.js';
import { User } from '../models/index.js';

/** What the local fake SMTP server received, newest first. */
export async function outbox(): Promise<OutboxMessageDto[]> {
  const rows = await User.sequelize!.query<{ id: number; to_address: string; subject: string; text: string; html: string; received_at: Date }>(
    'SELECT id, to_address, subject, text, html, received_at FROM captured_mail ORDER BY received_at DESC, id DESC LIMIT 500',
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, to: r.to_address, subject: r.subject, text: r.text, html: r.html, sentAt: new Date(r.received_at).toISOString() }));
}

/** Delivery state of every mail the product sent: pending retries and failures show here. */
export async function deliveries(): Promise<MailDeliveryDto[]> {
  const rows = await User.sequelize!.query<{ id: number; to_address: string; subject: string; status: MailDeliveryDto['status']; attempts: number; last_error: string | null; created_at: Date }>(
    'SELECT id, to_address, subject, status, attempts, last_error, created_at FROM mail_messages ORDER BY id DESC LIMIT 500',
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, to: r.to_address, subject: r.subject, status: r.status, attempts: r.attempts, lastError: r.last_error, createdAt: new Date(r.created_at).toISOString() }));
}
