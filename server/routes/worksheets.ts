import { Router } from 'express';
import { createWorksheetBody, roleCan, worksheetListQuery, type GroupRole, type WorksheetDto, type WorksheetSummaryDto } from '../../shared/api.js';
import { checkpointBody, draftBody, type HeadDto, type VersionDto } from '../../shared/versions-api.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole, requireWorksheetRole } from '../middleware/group-access.js';
import { forbidden, HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput } from '../middleware/validate.js';
import type { Worksheet } from '../models/index.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { storedReport, storeReport } from '../evaluation/stored.js';
import { evaluateForRequest } from './evaluate.js';
import { checkEvaluationLimits, checkWorksheetSize } from '../evaluation/limits.js';
import {
  createWorksheet, deleteWorksheet, discardDraft, findDraft, findHead, findVersion, listVersions, listWorksheetsForMember, milestoneCheck, milestoneSigners,
  saveDraft, saveWorksheet, signOffMilestone, unlessDeleted, withAuthor, worksheetGone,
} from '../services/worksheets.js';
import type { WorksheetVersion } from '../models/index.js';

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
    const user = currentUser(req);
    const query = parseInput(worksheetListQuery, req.query);
    // membership, page and count in one query (the session's user was read by passport)
    const listed = await listWorksheetsForMember(user.id, groupId, query);
    if (!listed) throw notFound('This group');
    if (!roleCan(listed.role, 'read')) throw forbidden();
    const items: WorksheetSummaryDto[] = listed.rows.map((w) => ({
      id: w.id,
      title: w.title,
      version: w.version,
      updatedAt: w.updatedAt.toISOString(),
      updatedBy: w.updatedBy ?? 'a former member',
    }));
    res.json({ items, total: listed.count, page: query.page, pageSize: query.pageSize });
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
    const body = parseInput(checkpointBody, req.body);
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

  const versionDto = (v: WorksheetVersion, signers: Map<number, string>): VersionDto => ({
    number: v.number,
    title: v.title,
    source: v.source,
    authorName: v.author?.displayName ?? 'a former member',
    createdAt: v.createdAt.toISOString(),
    name: v.name ?? null,
    kind: v.kind,
    milestone: v.milestoneAt ? { at: v.milestoneAt.toISOString(), by: (v.milestoneById && signers.get(v.milestoneById)) || 'a former member' } : null,
  });

  router.get('/:id/versions', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const versions = await listVersions(id);
    const signers = await milestoneSigners(versions);
    res.json({ versions: versions.map((v) => versionDto(v, signers)) });
  });

  // The latest version's number and author, without the text: polled by open windows.
  router.get('/:id/head', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const head = await findHead(id);
    if (!head) throw worksheetGone('a moment ago');
    const body: HeadDto = { version: head.version, title: head.title, updatedAt: head.updatedAt.toISOString(), updatedBy: head.updatedBy?.displayName ?? 'a former member' };
    res.set('cache-control', 'no-store').json(body);
  });

  // The caller's own draft (autosave keeps it; it is not a version and leaves no activity line).
  router.get('/:id/draft', async (req, res) => {
    const user = currentUser(req);
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    await requireWorksheetRole(user.id, id, 'editWorksheets');
    res.set('cache-control', 'no-store').json({ draft: await findDraft(id, user.id) });
  });

  router.put('/:id/draft', async (req, res) => {
    const user = currentUser(req);
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { role } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    const body = parseInput(draftBody, req.body);
    checkWorksheetSize(body.source);
    const outcome = await saveDraft(id, user.id, body);
    res.json({ draft: outcome.draft, worksheet: detail(outcome.head, role), autoVersion: outcome.autoVersion });
  });

  router.delete('/:id/draft', async (req, res) => {
    const user = currentUser(req);
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    await requireWorksheetRole(user.id, id, 'editWorksheets');
    await discardDraft(id, user.id);
    res.status(204).end();
  });

  // Whether a version can be signed off: each result and its review state in that version.
  router.get('/:id/versions/:number/milestone', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const number = idParam((req.params as Record<string, string>)['number'], 'This version');
    const version = await findVersion(id, number);
    if (!version) throw notFound(`Version ${number} of this worksheet`);
    res.json(await milestoneCheck(id, version));
  });

  // Signs a whole version off as a milestone: only when every result in it is confirmed by a review.
  router.post('/:id/versions/:number/milestone', async (req, res) => {
    const user = currentUser(req);
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    const number = idParam((req.params as Record<string, string>)['number'], 'This version');
    const outcome = await signOffMilestone(worksheet, number, user.id);
    if (!outcome) throw notFound(`Version ${number} of this worksheet`);
    if ('notReady' in outcome) {
      const open = outcome.notReady.results.filter((r) => r.status !== 'confirmed');
      const list = open.slice(0, 5).map((r) => `${r.key} (line ${r.line}, ${r.status})`).join(', ');
      throw new HttpError(
        409,
        'milestone_not_ready',
        open.length
          ? `Version ${number} cannot be signed off yet: ${open.length} result${open.length === 1 ? ' is' : 's are'} not confirmed by a review: ${list}${open.length > 5 ? ', …' : ''}.`
          : `Version ${number} has no results to confirm, so there is nothing to sign off.`,
        { check: outcome.notReady },
      );
    }
    const signers = await milestoneSigners([outcome.version]);
    const full = (await listVersions(id)).find((v) => v.number === number)!;
    res.json({ version: versionDto(full, signers) });
  });

  return router;
}
