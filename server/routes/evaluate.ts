import { Router } from 'express';
import { evaluateBody } from '../../shared/api.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { parseInput } from '../middleware/validate.js';

/** POST /api/evaluate {source}: the command line tool's JSON, computed in the worker pool. */
export function evaluateRoutes(pool: EvaluationPool): Router {
  const router = Router();
  router.post('/', async (req, res) => {
    const { source } = parseInput(evaluateBody, req.body);
    res.json(await pool.evaluate(source));
  });
  return router;
}
