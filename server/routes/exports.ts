import { Router, type Request } from 'express';
import type { EvaluationPool } from '../evaluation/pool.js';
import { latexAppendix, latexFragment, latexStandalone } from '../exports/latex.js';
import { compilePdf } from '../exports/pdf.js';
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
 * GET /api/worksheets/:id/export?format=swk|json|latex|latex-fragment|latex-standalone|pdf&version=N
 * (the current version by default). latex is the appendix of the whole record;
 * latex-fragment the results as equations with remarks, to \input into a paper;
 * latex-standalone that fragment and the record in a document of its own; pdf the
 * standalone document compiled by pdflatex (server/exports/pdf.ts).
 * A GET writes nothing: no activity line, no stored report. JSON and LaTeX use the stored
 * report when this engine made it, else one computed for this request only (under the
 * caller's cap, cancelled when the caller goes away).
 */
const FORMATS = ['swk', 'json', 'latex', 'latex-fragment', 'latex-standalone', 'pdf'];

export function exportRoutes(pool: EvaluationPool): Router {
  const router = Router();
  router.get('/worksheets/:id/export', async (req, res) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'read');
    const format = String(req.query['format'] ?? 'swk');
    if (!FORMATS.includes(format)) throw new HttpError(400, 'invalid_input', `format: Choose ${FORMATS.join(', ')}.`);
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
    const input = { title: version.title, version: number, report, reviews, labelPrefix: `sw${id}v${number}` };
    if (format === 'pdf') {
      const aborted = new AbortController();
      res.on('close', () => aborted.abort());
      const pdf = await compilePdf(latexStandalone(input), aborted.signal);
      res.set({ 'content-type': 'application/pdf', 'content-disposition': `attachment; filename="${name}.pdf"`, 'cache-control': 'no-store' }).send(pdf);
      return;
    }
    const [tex, suffix] =
      format === 'latex-fragment' ? [latexFragment(input), '-results'] : format === 'latex-standalone' ? [latexStandalone(input), '-standalone'] : [latexAppendix(input), ''];
    res.set({ 'content-type': 'application/x-tex; charset=utf-8', 'content-disposition': `attachment; filename="${name}${suffix}.tex"` }).send(tex);
  });
  return router;
}
