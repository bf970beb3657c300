import { Router, type Request, type Response } from 'express';
import { evaluateBody } from '../../shared/api.js';
import type { EvaluationProgress, WorksheetReport } from '../../shared/evaluation.js';
import { EvaluationCancelled, MalformedReport, type EvaluationPool } from '../evaluation/pool.js';
import { takeSlot, userOwner } from '../evaluation/slots.js';
import { currentUser } from '../middleware/auth.js';
import { HttpError } from '../middleware/http-error.js';
import { parseInput } from '../middleware/validate.js';
import { checkEvaluationLimits, type CheckedWorksheet } from '../evaluation/limits.js';
import { storedReport } from '../evaluation/stored.js';

const failed = (err: unknown) => `The evaluation stopped: ${err instanceof Error ? err.message : err}`;

/** Whose evaluation a request starts, and how many of theirs may run or wait at once. */
export interface EvaluationOwner {
  owner: string;
  cap: number;
}

/** The signed-in caller as owner, with the per-account cap. */
export const callerAsOwner = (pool: EvaluationPool, req: Request): EvaluationOwner => ({ owner: userOwner(currentUser(req).id), cap: pool.settings.capPerUser });

/**
 * An abort signal that fires when the caller goes away before the answer is complete
 * (the response closes unfinished), so queued or running work for it stops.
 */
export function abortOnDisconnect(res: Response): AbortSignal {
  const aborter = new AbortController();
  res.on('close', () => {
    if (!res.writableFinished) aborter.abort();
  });
  return aborter.signal;
}

/**
 * Evaluates for one request as JSON, under the owner's cap (429 with Retry-After beyond
 * it) and cancelled when the caller goes away. Resolves to null when the caller went
 * away; a worksheet over a limit the worker found rejects with that 413/422.
 */
export async function evaluateJsonForRequest(pool: EvaluationPool, source: string, res: Response, who: EvaluationOwner): Promise<WorksheetReport | null> {
  const signal = abortOnDisconnect(res);
  const slot = await takeSlot(res, who.owner, who.cap, pool.settings.worksheetBudgetMs);
  try {
    return await pool.evaluate(source, { signal, owner: who.owner });
  } catch (err) {
    if (err instanceof EvaluationCancelled) return null;
    if (err instanceof MalformedReport) throw new HttpError(500, 'evaluation_failed', failed(err));
    throw err;
  } finally {
    await slot.release();
  }
}

/**
 * The report a read-only route shows (referee page, exports): the stored report of that
 * version when this engine made it; otherwise it is computed for this request only —
 * not stored, so a GET changes nothing — under the same cap and cancellation as any
 * evaluation. Null when the caller went away.
 */
export async function shownReport(pool: EvaluationPool, worksheetId: number, version: number, source: string, res: Response, who: EvaluationOwner): Promise<WorksheetReport | null> {
  const stored = await storedReport(worksheetId, version);
  if (stored?.current) return stored.report;
  checkEvaluationLimits(source);
  return evaluateJsonForRequest(pool, source, res, who);
}

/**
 * Evaluates in the worker pool; with `Accept: text/event-stream` it streams a
 * `progress` event as each statement starts and then the `report`. A client that
 * disconnects cancels the work, queued or running. The caller's evaluations are capped
 * (429 with Retry-After beyond the cap; `who` says whose, the signed-in caller by
 * default). The stream's headers are sent only once the worker has read the worksheet,
 * so a worksheet over a limit still gets its 413/422 answer.
 * Resolves to null when the answer has already been sent (streamed, failed or cancelled).
 *
 * `beforeSend` runs on the finished report before the caller hears of it (the streamed
 * `report` event, or the return): a report that is stored is stored before anyone can ask for it.
 */
export async function evaluateForRequest(
  pool: EvaluationPool,
  source: string,
  _checked: CheckedWorksheet,
  req: Request,
  res: Response,
  beforeSend?: (report: WorksheetReport) => Promise<void>,
  who: EvaluationOwner = callerAsOwner(pool, req),
): Promise<WorksheetReport | null> {
  const streaming = req.accepts(['application/json', 'text/event-stream']) === 'text/event-stream';
  if (!streaming) {
    const report = await evaluateJsonForRequest(pool, source, res, who);
    if (report) await beforeSend?.(report);
    return report;
  }

  const signal = abortOnDisconnect(res);
  const slot = await takeSlot(res, who.owner, who.cap, pool.settings.worksheetBudgetMs);
  const send = (event: string, data: unknown) => res.write(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
  const open = () => {
    if (res.headersSent) return;
    res.status(200).set({ 'content-type': 'text/event-stream', 'cache-control': 'no-cache', 'x-accel-buffering': 'no' });
    res.flushHeaders();
  };
  try {
    const report = await pool.evaluate(source, {
      signal,
      owner: who.owner,
      progress: {
        onAccepted: open,
        onProgress: (p: EvaluationProgress) => {
          open();
          send('progress', p);
        },
      },
    });
    await beforeSend?.(report);
    open();
    send('report', report);
    return report;
  } catch (err) {
    if (err instanceof EvaluationCancelled) return null;
    // refused before the stream began (a limit the worker found): an ordinary error answer
    if (!res.headersSent) throw err instanceof MalformedReport ? new HttpError(500, 'evaluation_failed', failed(err)) : err;
    send('error', { error: { code: err instanceof HttpError ? err.code : 'evaluation_failed', message: err instanceof HttpError ? err.message : failed(err) } });
    return null;
  } finally {
    await slot.release();
    if (res.headersSent) res.end();
  }
}

/** POST /api/evaluate {source}: the command line tool's JSON, computed in the worker pool. */
export function evaluateRoutes(pool: EvaluationPool): Router {
  const router = Router();
  router.post('/', async (req, res) => {
    const { source } = parseInput(evaluateBody, req.body);
    const checked = checkEvaluationLimits(source);
    const report = await evaluateForRequest(pool, source, checked, req, res);
    if (report && !res.headersSent) res.json(report);
  });
  return router;
}
