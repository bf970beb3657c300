import { Router } from 'express';
import { Op, Transaction } from 'sequelize';
import {
  createWorksheetBody,
  saveWorksheetBody,
  worksheetListQuery,
  type GroupRole,
  type WorksheetDto,
  type WorksheetSummaryDto,
} from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole, requireWorksheetRole } from '../middleware/group-access.js';
import { HttpError } from '../middleware/http-error.js';
import { idParam, parseInput } from '../middleware/validate.js';
import { Evaluation, User, Worksheet, WorksheetVersion } from '../models/index.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { evaluateForRequest } from './evaluate.js';
import { recordActivity } from '../activity/record.js';
import { checkEvaluationLimits, checkWorksheetSize } from '../evaluation/limits.js';

const summary = (w: Worksheet): WorksheetSummaryDto => ({
  id: w.id,
  title: w.title,
  version: w.version,
  updatedAt: w.updatedAt.toISOString(),
  updatedBy: w.updatedBy?.displayName ?? 'a former member',
});

const detail = (w: Worksheet, role: GroupRole): WorksheetDto => ({ ...summary(w), groupId: w.groupId, source: w.source, role });

const withAuthor = { include: [{ model: User, as: 'updatedBy' }] };

/** Routes under /api/groups/:groupId/worksheets. */
export function groupWorksheetRoutes(): Router {
  const router = Router({ mergeParams: true });

  router.get('/', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    const query = parseInput(worksheetListQuery, req.query);
    const where = {
      groupId,
      ...(query.search ? { title: { [Op.iLike]: `%${query.search.replace(/[\\%_]/g, (c) => '\\' + c)}%` } } : {}),
    };
    const { rows, count } = await Worksheet.findAndCountAll({
      where,
      // A summary needs no source text, and a source may be 200 kB.
      attributes: { exclude: ['source'] },
      ...withAuthor,
      order: [
        [query.sort, query.direction.toUpperCase()],
        ['id', 'ASC'],
      ],
      limit: query.pageSize,
      offset: query.page * query.pageSize,
    });
    res.json({ items: rows.map(summary), total: count, page: query.page, pageSize: query.pageSize });
  });

  router.post('/', async (req, res) => {
    const user = currentUser(req);
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    const role = await requireGroupRole(user.id, groupId, 'editWorksheets');
    const body = parseInput(createWorksheetBody, req.body);
    checkWorksheetSize(body.source);
    const worksheet = await Worksheet.sequelize!.transaction(async (transaction) => {
      const created = await Worksheet.create({ groupId, title: body.title, source: body.source, updatedById: user.id }, { transaction });
      await WorksheetVersion.create({ worksheetId: created.id, number: 1, title: body.title, source: body.source, authorId: user.id }, { transaction });
      await recordActivity(Worksheet.sequelize!, { groupId, userId: user.id, action: 'created worksheet', subject: body.title, worksheetId: created.id }, transaction);
      return created;
    });
    worksheet.updatedBy = user;
    res.status(201).json({ worksheet: detail(worksheet, role) });
  });

  return router;
}

/** Routes under /api/worksheets/:id. */
export function worksheetRoutes(pool: EvaluationPool): Router {
  const router = Router();

  // The stored report of the current version, so a reopened worksheet shows results at once.
  router.get('/:id/evaluation', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'read');
    const stored = await Evaluation.findOne({ where: { worksheetId: id, version: worksheet.version } });
    if (!stored) throw new HttpError(404, 'not_evaluated', `Version ${worksheet.version} has not been evaluated yet. Evaluate it to see its results.`);
    res.json({ version: stored.version, report: stored.report });
  });

  // Evaluates the current saved version and keeps the report with it.
  router.post('/:id/evaluation', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'read');
    const stored = await Evaluation.findOne({ where: { worksheetId: id, version: worksheet.version } });
    if (stored && req.query['fresh'] !== '1') {
      res.json({ version: stored.version, report: stored.report });
      return;
    }
    checkEvaluationLimits(worksheet.source);
    const report = await evaluateForRequest(pool, worksheet.source, req, res);
    if (!report) return;
    // Two readers evaluating the same version at once both store: keep the first.
    await Evaluation.upsert({ worksheetId: id, version: worksheet.version, report }, { conflictFields: ['worksheet_id', 'version'] } as never);
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
    // The row lock makes concurrent saves queue up: each sees the version the one
    // before it wrote, so exactly one save per base version lands.
    const saved = await Worksheet.sequelize!.transaction(async (transaction) => {
      const current = (await Worksheet.findByPk(id, { transaction, lock: Transaction.LOCK.UPDATE }))!;
      if (current.version !== body.baseVersion) return { conflict: current };
      const number = current.version + 1;
      const title = body.title ?? current.title;
      await current.update({ title, source: body.source, version: number, updatedById: user.id }, { transaction });
      await WorksheetVersion.create({ worksheetId: id, number, title, source: body.source, authorId: user.id }, { transaction });
      await recordActivity(Worksheet.sequelize!, { groupId: current.groupId, userId: user.id, action: 'saved worksheet', subject: `${title} v${number}`, worksheetId: id }, transaction);
      return { saved: current };
    });
    if ('conflict' in saved) {
      const current = (await Worksheet.findByPk(id, withAuthor))!;
      throw new HttpError(
        409,
        'version_conflict',
        `Someone saved version ${current.version} of this worksheet while you were editing version ${body.baseVersion}. Your text was not saved; compare the two and save again.`,
        { current: detail(current, role) },
      );
    }
    const worksheet = (await Worksheet.findByPk(id, withAuthor))!;
    res.json({ worksheet: detail(worksheet, role) });
  });

  router.delete('/:id', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'editWorksheets');
    await Worksheet.sequelize!.transaction(async (transaction) => {
      await worksheet.destroy({ transaction });
      await recordActivity(Worksheet.sequelize!, { groupId: worksheet.groupId, userId: currentUser(req).id, action: 'deleted worksheet', subject: worksheet.title }, transaction);
    });
    res.status(204).end();
  });

  router.get('/:id/versions', async (req, res) => {
    const id = idParam((req.params as Record<string, string>)['id'], 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const versions = await WorksheetVersion.findAll({
      where: { worksheetId: id },
      include: [{ model: User, as: 'author' }],
      order: [['number', 'DESC']],
    });
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
