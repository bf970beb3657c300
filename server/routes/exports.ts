import { Router, type Request } from 'express';
import type { EvaluationPool } from '../evaluation/pool.js';
import { latexAppendix } from '../exports/latex.js';
import { currentUser } from '../middleware/auth.js';
import { requireWorksheetRole } from '../middleware/group-access.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, routeParam } from '../middleware/validate.js';
import { findVersionToExport } from '../services/exports.js';
import { callerAsOwner, shownReport } from './evaluate.js';
import { statementReviews } from '../services/reviews.js';

// A title, not worksheet text: the pattern only picks a safe file name.
const fileSafe = (title: string) => title.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'worksheet';

/**
 * GET /api/worksheets/:id/export?format=swk|json|latex&version=N (the current version by default).
 * A GET writes nothing: no activity line, no stored report. JSON and LaTeX use the stored
 * report when this engine made it, else one computed for this request only (under the
 * caller's cap, cancelled when the caller goes away).
 */
export function exportRoutes(pool: EvaluationPool): Router {
  const router = Router();
  router.get('/worksheets/:id/export', async (req, res) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'read');
    const format = String(req.query['format'] ?? 'swk');
    if (!['swk', 'json', 'latex'].includes(format)) throw new HttpError(400, 'invalid_input', 'format: Choose swk, json or latex.');
    const number = req.query['version'] ? idParam(req.query['version'], 'This version') : worksheet.version;
    const version = await findVersionToExport(id, number);
    if (!version) throw notFound(`Version ${number} of this worksheet`);
    const name = `${fileSafe(version.title)}-v${number}`;
    if (format === 'swk') {
      res.set({ 'content-type': 'text/plain; charset=utf-8', 'content-disposition': `attachment; filename="${name}.swk"` }).send(version.source);
      return;
    }
    const report = await shownReport(pool, id, number, version.source, res, callerAsOwner(pool, req));
    if (!report) return; // the caller went away
    // Review status belongs to the statements as they stand in this version.
    const reviews = await statementReviews(id, version.source);
    if (format === 'json') {
      res.set({ 'content-disposition': `attachment; filename="${name}.json"` }).json({
        worksheet: { id, title: version.title, version: number, savedAt: version.createdAt.toISOString() },
        source: version.source,
        report,
        reviews,
      });
      return;
    }
    res
      .set({ 'content-type': 'application/x-tex; charset=utf-8', 'content-disposition': `attachment; filename="${name}.tex"` })
      .send(latexAppendix({ title: version.title, version: number, report, reviews }));
  });
  return router;
}
