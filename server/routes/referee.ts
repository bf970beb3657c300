import { Router } from 'express';
import { z } from 'zod';
import { hashToken, newToken } from '../auth/tokens.js';
import type { ServerConfig } from '../config.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { refereeOwner } from '../evaluation/slots.js';
import { currentUser, requireUser } from '../middleware/auth.js';
import { requireWorksheetRole } from '../middleware/group-access.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput, routeParam } from '../middleware/validate.js';
import { shownReport } from './evaluate.js';
import { latexStandalone } from '../exports/latex.js';
import { compilePdf } from '../exports/pdf.js';
import { statementReviews } from '../services/reviews.js';
import { createRefereeLink, findRefereeLink, findVersion, listRefereeLinks, revokeRefereeLink } from '../services/referee.js';

const createBody = z.object({ version: z.number().int().min(1).optional(), days: z.number().int().min(1).max(90, 'A referee link lasts at most 90 days.') });

/** Read-only links to one frozen version, for a referee without an account. */
export function refereeRoutes(config: ServerConfig, pool: EvaluationPool): Router {
  const router = Router();

  router.post('/worksheets/:id/referee-links', requireUser, async (req, res) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    const body = parseInput(createBody, req.body);
    const version = body.version ?? worksheet.version;
    if (!(await findVersion(id, version))) throw notFound(`Version ${version} of this worksheet`);
    const { token, hash } = newToken();
    const row = await createRefereeLink({ worksheet, version, tokenHash: hash, userId: user.id, days: body.days });
    // The token is shown once, here; only its hash is kept.
    res.status(201).json({ link: { id: row.id, version, expiresAt: new Date(row.expires_at).toISOString(), url: `${config.publicUrl}/referee/${token}` } });
  });

  router.get('/worksheets/:id/referee-links', requireUser, async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'editWorksheets');
    const rows = await listRefereeLinks(id);
    res.json({ links: rows.map((r) => ({ id: r.id, version: r.version, expiresAt: new Date(r.expires_at).toISOString(), revoked: r.revoked_at !== null, createdAt: new Date(r.created_at).toISOString() })) });
  });

  router.delete('/worksheets/:id/referee-links/:linkId', requireUser, async (req, res) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    await revokeRefereeLink(worksheet, idParam(routeParam(req, 'linkId'), 'This link'), user.id);
    res.status(204).end();
  });

  // No account needed: the worksheet's one frozen version and its findings, nothing else.
  // Nothing is written: the stored report when current, else one computed for this
  // request only, under the link's own cap and cancelled when the referee goes away.
  /** The link's row when it may be used now; otherwise the reason as an error. */
  const usableLink = async (token: string) => {
    const link = token.length > 200 ? undefined : await findRefereeLink(hashToken(token));
    if (!link) throw new HttpError(404, 'link_unknown', 'This referee link is not valid. Ask the authors for a new one.');
    if (link.revoked_at) throw new HttpError(410, 'link_revoked', 'This referee link was withdrawn by the authors.');
    if (new Date(link.expires_at).getTime() <= Date.now()) throw new HttpError(410, 'link_expired', 'This referee link has expired. Ask the authors for a new one.');
    return link;
  };

  router.get('/referee/:token', async (req, res) => {
    const link = await usableLink(String(routeParam(req, 'token')));
    const version = (await findVersion(link.worksheet_id, link.version))!;
    const report = await shownReport(pool, link.worksheet_id, link.version, version.source, res, { owner: refereeOwner(link.id), cap: pool.settings.capPerRefereeLink });
    if (!report) return; // the referee went away
    res.set('cache-control', 'no-store').json({
      worksheet: { title: version.title, version: link.version, savedAt: version.createdAt.toISOString(), source: version.source },
      report,
      expiresAt: new Date(link.expires_at).toISOString(),
    });
  });

  // The record of the link's version as a PDF: the standalone LaTeX export compiled by
  // pdflatex (server/exports/pdf.ts). Review states are shown without reviewers' names.
  router.get('/referee/:token/pdf', async (req, res) => {
    const link = await usableLink(String(routeParam(req, 'token')));
    const version = (await findVersion(link.worksheet_id, link.version))!;
    const report = await shownReport(pool, link.worksheet_id, link.version, version.source, res, { owner: refereeOwner(link.id), cap: pool.settings.capPerRefereeLink });
    if (!report) return;
    const reviews = await statementReviews(link.worksheet_id, version.source);
    const aborted = new AbortController();
    res.on('close', () => aborted.abort());
    const pdf = await compilePdf(latexStandalone({ title: version.title, version: link.version, report, reviews, reviewerNames: false }), aborted.signal);
    const name = version.title.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'worksheet';
    res.set({ 'content-type': 'application/pdf', 'content-disposition': `attachment; filename="${name}-v${link.version}.pdf"`, 'cache-control': 'no-store' }).send(pdf);
  });

  return router;
}
