import type { ErrorRequestHandler, RequestHandler } from 'express';
import { isDatabaseUnavailable } from '../db/unavailable.js';
import { EvaluationCancelled } from '../evaluation/pool.js';
import type { Logger } from '../logger.js';
import { HttpError } from './http-error.js';

export const unknownApiRoute: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, 'not_found', `There is no API route ${req.method} ${req.path}.`));
};

/** Turns every error into `{ error: { code, message } }`; no stack trace leaves the server. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    // The caller went away during an evaluation: nobody is waiting for an answer.
    if (err instanceof EvaluationCancelled) {
      logger.debug({ url: req.originalUrl }, 'evaluation cancelled: the caller went away');
      if (!res.writableEnded) res.end();
      return;
    }
    // A streamed answer (server-sent events) has begun: nothing more can be said.
    if (res.headersSent) {
      res.end();
      return;
    }
    if (err instanceof HttpError) {
      res.status(err.status).json({ error: { code: err.code, message: err.message }, ...err.extra });
      return;
    }
    // body-parser's errors carry a status and a type.
    const status = typeof err?.status === 'number' ? err.status : 500;
    if (err?.type === 'entity.parse.failed') {
      res.status(400).json({ error: { code: 'malformed_json', message: 'The request body is not valid JSON. Check the syntax and send it again.' } });
      return;
    }
    if (err?.type === 'entity.too.large' || status === 413) {
      res.status(413).json({
        error: { code: 'too_large', message: `The request is larger than the limit of ${err?.limit ? Math.round(err.limit / 1024) + ' kB' : 'this route'}. Send less at once.` },
      });
      return;
    }
    if (status >= 400 && status < 500) {
      res.status(status).json({ error: { code: 'bad_request', message: 'The request could not be understood. Check it and send it again.' } });
      return;
    }
    if (isDatabaseUnavailable(err)) {
      logger.warn({ err: err?.message }, 'database unavailable');
      res.status(503).json({ error: { code: 'database_unavailable', message: 'The database is not reachable just now. Wait a moment and try again; nothing was saved.' } });
      return;
    }
    logger.error({ err, url: req.originalUrl }, 'unhandled error');
    res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server. Try again; if it keeps happening, tell the site admin.' } });
  };
}
