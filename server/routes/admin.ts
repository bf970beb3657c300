import { monitorEventLoopDelay } from 'node:perf_hooks';
import { Router } from 'express';
import { adminUserPatchBody } from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput } from '../middleware/validate.js';
import { QueryTypes } from 'sequelize';
import type { MailDeliveryDto, OutboxMessageDto } from '../../shared/collaboration.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { User } from '../models/index.js';

/** Site administration; mounted behind requireAdmin. */
const loopDelay = monitorEventLoopDelay({ resolution: 10 });
loopDelay.enable();

export function adminRoutes(evaluationPool: EvaluationPool): Router {
  const router = Router();

  // Event-loop delay since the last reset: evaluation must not block the loop.
  router.get('/metrics', (req, res) => {
    const ms = (ns: number) => Math.round(ns / 1e4) / 100;
    res.json({
      eventLoopDelayMs: { p50: ms(loopDelay.percentile(50)), p99: ms(loopDelay.percentile(99)), max: ms(loopDelay.max) },
      memoryMb: Math.round(process.memoryUsage().rss / 1048576),
      // Started beyond the pool's size means workers were replaced (time or memory limit, or a crash).
      evaluationWorkers: { size: evaluationPool.size, started: evaluationPool.spawned },
    });
    if (req.query['reset'] === '1') loopDelay.reset();
  });

  router.get('/users', async (_req, res) => {
    const users = await User.findAll({ order: [['id', 'ASC']] });
    res.json({ users: users.map((u) => u.toDto()) });
  });

  router.patch('/users/:id', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This account');
    const body = parseInput(adminUserPatchBody, req.body);
    if (id === currentUser(req).id && body.disabled) {
      throw new HttpError(409, 'self_disable', 'You cannot disable your own account. Ask another site admin.');
    }
    const user = await User.findByPk(id);
    if (!user) throw notFound('This account');
    await user.update({ disabled: body.disabled });
    // A disabled account's sessions end: deserializeUser refuses it on the next request.
    res.json({ user: user.toDto() });
  });

  // What the local fake SMTP server received, newest first.
  router.get('/outbox', async (_req, res) => {
    const rows = await User.sequelize!.query<{ id: number; to_address: string; subject: string; text: string; html: string; received_at: Date }>(
      'SELECT id, to_address, subject, text, html, received_at FROM captured_mail ORDER BY received_at DESC, id DESC LIMIT 500',
      { type: QueryTypes.SELECT },
    );
    const messages: OutboxMessageDto[] = rows.map((r) => ({ id: r.id, to: r.to_address, subject: r.subject, text: r.text, html: r.html, sentAt: new Date(r.received_at).toISOString() }));
    res.json({ messages });
  });

  // Delivery state of every mail the product sent: pending retries and failures show here.
  router.get('/mail-deliveries', async (_req, res) => {
    const rows = await User.sequelize!.query<{ id: number; to_address: string; subject: string; status: MailDeliveryDto['status']; attempts: number; last_error: string | null; created_at: Date }>(
      'SELECT id, to_address, subject, status, attempts, last_error, created_at FROM mail_messages ORDER BY id DESC LIMIT 500',
      { type: QueryTypes.SELECT },
    );
    const deliveries: MailDeliveryDto[] = rows.map((r) => ({ id: r.id, to: r.to_address, subject: r.subject, status: r.status, attempts: r.attempts, lastError: r.last_error, createdAt: new Date(r.created_at).toISOString() }));
    res.json({ deliveries });
  });

  return router;
}
