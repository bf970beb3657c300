import { monitorEventLoopDelay } from 'node:perf_hooks';
import { Router } from 'express';
import { adminUserPatchBody } from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { HttpError } from '../middleware/http-error.js';
import { idParam, parseInput } from '../middleware/validate.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { deliveries, outbox } from '../services/mail-log.js';
import { listUsers, setDisabled } from '../services/users.js';

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
      evaluationWorkers: { size: evaluationPool.size, started: evaluationPool.spawned, evaluations: evaluationPool.evaluations },
    });
    if (req.query['reset'] === '1') loopDelay.reset();
  });

  router.get('/users', async (_req, res) => {
    const users = await listUsers();
    res.json({ users: users.map((u) => u.toDto()) });
  });

  router.patch('/users/:id', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This account');
    const body = parseInput(adminUserPatchBody, req.body);
    if (id === currentUser(req).id && body.disabled) {
      throw new HttpError(409, 'self_disable', 'You cannot disable your own account. Ask another site admin.');
    }
    const user = await setDisabled(id, body.disabled);
    res.json({ user: user.toDto() });
  });

  router.get('/outbox', async (_req, res) => {
    res.json({ messages: await outbox() });
  });

  router.get('/mail-deliveries', async (_req, res) => {
    res.json({ deliveries: await deliveries() });
  });

  return router;
}
