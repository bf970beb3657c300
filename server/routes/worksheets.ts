import { Router } from 'express';
import { createWorksheetBody, saveWorksheetBody, worksheetListQuery, type GroupRole, type WorksheetDto, type WorksheetSummaryDto } from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole, requireWorksheetRole } from '../middleware/group-access.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput } from '../middleware/validate.js';
import type { Worksheet } from '../models/index.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { storedReport, storeReport } from '../evaluation/stored.js';
import { evaluateForRequest } from './evaluate.js';
import { checkEvaluationLimits, checkWorksheetSize } from '../evaluation/limits.js';
import { createWorksheet, deleteWorksheet, listVersions, listWorksheets, saveWorksheet, unlessDeleted, withAuthor, worksheetGone } from '../services/worksheets.js';

const summary = (w: Worksheet): WorksheetSummaryDto => ({
  id: w.id,
  title: w.title,
  version: w.version,
  updatedAt: w.updatedAt.toISOString(),
  updatedBy: w.updatedBy?.displayName ?? 'a former member',
});

const detail = (w: Worksheet, role: GroupRole): WorksheetDto => ({ ...summary(w), groupId: w.groupId, source: w.source, role });

/** Routes under /api/groups/:groupId/worksheets. */
export function groupWorksheetRoutes(): Router {
  const router = Router({ mergeParams: true });

  router.get('/', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    const query = parseInput(worksheetListQuery, req.query);
    const { rows, count } = await listWorksheets(groupId, query);
    res.json({ items: rows.map(summary), total: count, page: query.page, pageSize: query.pageSize });
  });

  router.post('/', async (req, res) => {
    const user = currentUser(req);
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    const role = await requireGroupRole(user.id, groupId, 'editWorksheets');
    const body = parseInput(createWorksheetBody, req.body);
    checkWorksheetSize(body.source);
    // The group may be deleted meanwhile: then its row is gone and the insert's key with it.
    const worksheet = await unlessDeleted(() => createWorksheet({ groupId, user, title: body.title, source: body.source, action: 'created worksheet' }), () => notFound('This group'));
    res.status(201).json({ worksheet: detail(worksheet, role) });
  });

  return router;
}

/** Routes under /api/worksheets/:id. */
export function worksheetRoutes(pool: EvaluationPool): Router {
  const router = Router();

  // The stored report of the current version; 404 when there is none made by this engine.
  router.get('/:id/evaluation', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'read');
    const stored = await storedReport(id, worksheet.version);
    if (!stored?.current) throw new HttpError(404, 'not_evaluated', `Version ${worksheet.version} has not been evaluated yet. Evaluate it to see its results.`);
    res.json({ version: worksheet.version, report: stored.report });
  });

  // Evaluates the current saved version and keeps the report with it (a current stored one is reused).
  router.post('/:id/evaluation', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'read');
    const stored = await storedReport(id, worksheet.version);
    if (stored?.current && req.query['fresh'] !== '1') {
      res.json({ version: worksheet.version, report: stored.report });
      return;
    }
    const checked = checkEvaluationLimits(worksheet.source);
    const report = await evaluateForRequest(pool, worksheet.source, checked, req, res);
    if (!report) return;
    await unlessDeleted(() => storeReport(id, worksheet.version, report), () => worksheetGone('while it was being evaluated'));
    if (!res.headersSent) res.json({ version: worksheet.version, report });
  });

  router.get('/:id', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { worksheet, role } = await requireWorksheetRole(currentUser(req).id, id, 'read', withAuthor);
    res.json({ worksheet: detail(worksheet, role) });
  });

  router.put('/:id', async (req, res) => {
    const user = currentUser(req);
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { role } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    const body = parseInput(saveWorksheetBody, req.body);
    checkWorksheetSize(body.source);
    const outcome = await saveWorksheet(id, user.id, body);
    if ('conflict' in outcome) {
      throw new HttpError(
        409,
        'version_conflict',
        `Someone saved version ${outcome.conflict.version} of this worksheet while you were editing version ${body.baseVersion}. Your text was not saved; compare the two and save again.`,
        { current: detail(outcome.conflict, role) },
      );
    }
    res.json({ worksheet: detail(outcome.saved, role) });
  });

  router.delete('/:id', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'editWorksheets');
    await deleteWorksheet(worksheet, currentUser(req).id);
    res.status(204).end();
  });

  router.get('/:id/versions', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const versions = await listVersions(id);
    res.json({
      versions: versions.map((v) => ({
        number: v.number,
        title: v.title,
        source: v.source,
        authorName: v.author?.displayName ?? 'a former member',
        createdAt: v.createdAt.toISOString(),
      })),
    });
  });

  return router;
}
