import { Router, type Request, type Response } from 'express';
import { evaluateBody } from '../../shared/api.js';
import type { WorksheetReport } from '../../shared/evaluation.js';
import { EvaluationCancelled, type EvaluationPool } from '../evaluation/pool.js';
import { parseInput } from '../middleware/validate.js';
import { checkEvaluationLimits } from '../evaluation/limits.js';

/** One statement a line, blank lines and comments aside: the total for progress reports. */
export function countStatements(source: string): number {
  return source.split('\n').filter((l) => l.trim() && !l.trim().startsWith('#')).length;
}

/**
 * Evaluates in the worker pool; with `Accept: text/event-stream` it streams a
 * `progress` event as each statement starts and then the `report`. A client that
 * disconnects cancels the work.
 */
export async function evaluateForRequest(pool: EvaluationPool, source: string, req: Request, res: Response): Promise<WorksheetReport | null> {
  const aborter = new AbortController();
  res.on('close', () => {
    if (!res.writableFinished) aborter.abort();
  });
  const streaming = /text\/event-stream/.test(req.get('accept') ?? '');
  if (!streaming) return pool.evaluate(source, { signal: aborter.signal });

  res.status(200).set({ 'content-type': 'text/event-stream', 'cache-control': 'no-cache', 'x-accel-buffering': 'no' });
  res.flushHeaders();
  const send = (event: string, data: unknown) => res.write(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
  const total = countStatements(source);
  try {
    const report = await pool.evaluate(source, { signal: aborter.signal, onProgress: (p) => send('progress', { ...p, total }) });
    send('report', report);
    return report;
  } catch (err) {
    if (!(err instanceof EvaluationCancelled)) {
      send('error', { error: { code: 'evaluation_failed', message: `The evaluation stopped: ${err instanceof Error ? err.message : err}` } });
    }
    return null;
  } finally {
    res.end();
  }
}

/** POST /api/evaluate {source}: the command line tool's JSON, computed in the worker pool. */
export function evaluateRoutes(pool: EvaluationPool): Router {
  const router = Router();
  router.post('/', async (req, res) => {
    const { source } = parseInput(evaluateBody, req.body);
    checkEvaluationLimits(source);
    try {
      const report = await evaluateForRequest(pool, source, req, res);
      if (report && !res.headersSent) res.json(report);
    } catch (err) {
      if (err instanceof EvaluationCancelled) return; // the client went away
      throw err;
    }
  });
  return router;
}
