import { Router, type Request } from 'express';
import { QueryTypes } from 'sequelize';
import { z } from 'zod';
import { recordActivity } from '../activity/record.js';
import { hashToken, newToken } from '../auth/tokens.js';
import type { ServerConfig } from '../config.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { reportForVersion } from '../evaluation/stored.js';
import { currentUser, requireUser } from '../middleware/auth.js';
import { requireWorksheetRole } from '../middleware/group-access.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput, routeParam } from '../middleware/validate.js';
import { WorksheetVersion } from '../models/index.js';

const createBody = z.object({ version: z.number().int().min(1).optional(), days: z.number().int().min(1).max(90, 'A referee link lasts at most 90 days.') });

/** Read-only links to one frozen version, for a referee without an account. */
export function refereeRoutes(config: ServerConfig, pool: EvaluationPool): Router {
  const router = Router();
  const q = <T extends object>(sql: string, bind: unknown[]) => WorksheetVersion.sequelize!.query<T>(sql, { bind, type: QueryTypes.SELECT });

  router.post('/worksheets/:id/referee-links', requireUser, async (req, res) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    const body = parseInput(createBody, req.body);
    const version = body.version ?? worksheet.version;
    if (!(await WorksheetVersion.findOne({ where: { worksheetId: id, number: version } }))) throw notFound(`Version ${version} of this worksheet`);
    const { token, hash } = newToken();
    const [row] = await q<{ id: number; expires_at: Date }>(
      `INSERT INTO referee_links (worksheet_id, version, token_hash, created_by_id, expires_at) VALUES ($1, $2, $3, $4, now() + make_interval(days => $5)) RETURNING id, expires_at`,
      [id, version, hash, user.id, body.days],
    );
    await recordActivity(WorksheetVersion.sequelize!, { groupId: worksheet.groupId, userId: user.id, action: 'created referee link', subject: `${worksheet.title} v${version}`, worksheetId: id });
    // The token is shown once, here; only its hash is kept.
    res.status(201).json({ link: { id: row!.id, version, expiresAt: new Date(row!.expires_at).toISOString(), url: `${config.publicUrl}/referee/${token}` } });
  });

  router.get('/worksheets/:id/referee-links', requireUser, async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'editWorksheets');
    const rows = await q<{ id: number; version: number; expires_at: Date; revoked_at: Date | null; created_at: Date }>(
      'SELECT id, version, expires_at, revoked_at, created_at FROM referee_links WHERE worksheet_id = $1 ORDER BY id DESC',
      [id],
    );
    res.json({ links: rows.map((r) => ({ id: r.id, version: r.version, expiresAt: new Date(r.expires_at).toISOString(), revoked: r.revoked_at !== null, createdAt: new Date(r.created_at).toISOString() })) });
  });

  router.delete('/worksheets/:id/referee-links/:linkId', requireUser, async (req, res) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    await q('UPDATE referee_links SET revoked_at = now() WHERE id = $1 AND worksheet_id = $2 AND revoked_at IS NULL RETURNING id', [idParam(routeParam(req, 'linkId'), 'This link'), id]);
    await recordActivity(WorksheetVersion.sequelize!, { groupId: worksheet.groupId, userId: user.id, action: 'revoked referee link', subject: worksheet.title, worksheetId: id });
    res.status(204).end();
  });

  // No account needed: the worksheet's one frozen version and its findings, nothing else.
  router.get('/referee/:token', async (req, res) => {
    const token = String(routeParam(req, 'token'));
    const [link] = token.length > 200 ? [] : await q<{ worksheet_id: number; version: number; expires_at: Date; revoked_at: Date | null }>(
      'SELECT worksheet_id, version, expires_at, revoked_at FROM referee_links WHERE token_hash = $1',
      [hashToken(token)],
    );
    if (!link) throw new HttpError(404, 'link_unknown', 'This referee link is not valid. Ask the authors for a new one.');
    if (link.revoked_at) throw new HttpError(410, 'link_revoked', 'This referee link was withdrawn by the authors.');
    if (new Date(link.expires_at).getTime() <= Date.now()) throw new HttpError(410, 'link_expired', 'This referee link has expired. Ask the authors for a new one.');
    const version = (await WorksheetVersion.findOne({ where: { worksheetId: link.worksheet_id, number: link.version } }))!;
    const report = await reportForVersion(pool, link.worksheet_id, link.version, version.source);
    res.set('cache-control', 'no-store').json({
      worksheet: { title: version.title, version: link.version, savedAt: version.createdAt.toISOString(), source: version.source },
      report,
      expiresAt: new Date(link.expires_at).toISOString(),
    });
  });

  return router;
}
