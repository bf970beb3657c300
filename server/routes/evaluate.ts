import { Router, type Request, type Response } from 'express';
import { evaluateBody } from '../../shared/api.js';
import type { EvaluationProgress, WorksheetReport } from '../../shared/evaluation.js';
import { EvaluationCancelled, MalformedReport, type EvaluationPool } from '../evaluation/pool.js';
import { HttpError } from '../middleware/http-error.js';
import { parseInput } from '../middleware/validate.js';
import { checkEvaluationLimits, type CheckedWorksheet } from '../evaluation/limits.js';

const failed = (err: unknown) => `The evaluation stopped: ${err instanceof Error ? err.message : err}`;

/**
 * Evaluates in the worker pool; with `Accept: text/event-stream` it streams a
 * `progress` event as each statement starts and then the `report`. A client that
 * disconnects cancels the work. `checked` is what checkEvaluationLimits returned.
 * Resolves to null when the answer has already been sent (streamed, failed or cancelled).
 */
/**
 * `beforeSend` runs on the finished report before the caller hears of it (the streamed
 * `report` event, or the return): a report that is stored is stored before anyone can ask for it.
 */
export async function evaluateForRequest(pool: EvaluationPool, source: string, checked: CheckedWorksheet, req: Request, res: Response, beforeSend?: (report: WorksheetReport) => Promise<void>): Promise<WorksheetReport | null> {
  const aborter = new AbortController();
  res.on('close', () => {
    if (!res.writableFinished) aborter.abort();
  });
  const streaming = req.accepts(['application/json', 'text/event-stream']) === 'text/event-stream';
  if (!streaming) {
    try {
      const report = await pool.evaluate(source, { signal: aborter.signal });
      await beforeSend?.(report);
      return report;
    } catch (err) {
      if (err instanceof MalformedReport) throw new HttpError(500, 'evaluation_failed', failed(err));
      throw err;
    }
  }

  res.status(200).set({ 'content-type': 'text/event-stream', 'cache-control': 'no-cache', 'x-accel-buffering': 'no' });
  res.flushHeaders();
  const send = (event: string, data: unknown) => res.write(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
  try {
    const report = await pool.evaluate(source, {
      signal: aborter.signal,
      progress: { total: checked.statements, onProgress: (p: EvaluationProgress) => send('progress', p) },
    });
    await beforeSend?.(report);
    send('report', report);
    return report;
  } catch (err) {
    if (!(err instanceof EvaluationCancelled)) send('error', { error: { code: 'evaluation_failed', message: failed(err) } });
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
    const checked = checkEvaluationLimits(source);
    try {
      const report = await evaluateForRequest(pool, source, checked, req, res);
      if (report && !res.headersSent) res.json(report);
    } catch (err) {
      if (err instanceof EvaluationCancelled) return; // the client went away
      throw err;
    }
  });
  return router;
}
