/** Queries of worksheets and their versions. */
import { ForeignKeyConstraintError, Op, Transaction } from 'sequelize';
import type { WorksheetListQuery } from '../../shared/api.js';
import { recordActivity } from '../activity/record.js';
import { HttpError } from '../middleware/http-error.js';
import { User, Worksheet, WorksheetVersion } from '../models/index.js';

export const withAuthor = { include: [{ model: User, as: 'updatedBy' }] };

const likePattern = (search: string) => {
  let escaped = '';
  for (const ch of search) escaped += ch === '\\' || ch === '%' || ch === '_' ? `\\${ch}` : ch;
  return `%${escaped}%`;
};

/** One page of a group's worksheets, without their source (a source may be 200 kB). */
export function listWorksheets(groupId: number, query: WorksheetListQuery) {
  return Worksheet.findAndCountAll({
    where: { groupId, ...(query.search ? { title: { [Op.iLike]: likePattern(query.search) } } : {}) },
    attributes: { exclude: ['source'] },
    ...withAuthor,
    order: [
      [query.sort, query.direction.toUpperCase()],
      ['id', 'ASC'],
    ],
    limit: query.pageSize,
    offset: query.page * query.pageSize,
  });
}

/** A new worksheet with its version 1, recorded in the group's activity. */
export async function createWorksheet(o: { groupId: number; user: User; title: string; source: string; action: 'created worksheet' | 'imported worksheet' }): Promise<Worksheet> {
  const worksheet = await Worksheet.sequelize!.transaction(async (transaction) => {
    const created = await Worksheet.create({ groupId: o.groupId, title: o.title, source: o.source, updatedById: o.user.id }, { transaction });
    await WorksheetVersion.create({ worksheetId: created.id, number: 1, title: o.title, source: o.source, authorId: o.user.id }, { transaction });
    await recordActivity(Worksheet.sequelize!, { groupId: o.groupId, userId: o.user.id, action: o.action, subject: o.title, worksheetId: created.id }, transaction);
    return created;
  });
  worksheet.updatedBy = o.user;
  return worksheet;
}

/**
 * Runs `work`; a row it refers to that another request deleted meanwhile (a foreign key
 * violation: the group or worksheet is gone) becomes `gone()` instead of a 500.
 */
export async function unlessDeleted<T>(work: () => Promise<T>, gone: () => HttpError): Promise<T> {
  try {
    return await work();
  } catch (err) {
    if (err instanceof ForeignKeyConstraintError) throw gone();
    throw err;
  }
}

export const findWorksheetWithAuthor = (id: number, transaction?: Transaction) => Worksheet.findByPk(id, { ...withAuthor, ...(transaction ? { transaction } : {}) });

/** Said when the worksheet was deleted by someone else while this request waited for it. */
export const worksheetGone = (what: string) =>
  new HttpError(404, 'worksheet_deleted', `This worksheet was deleted by someone else ${what}. Nothing was changed; copy any text you want to keep into a new worksheet.`);

/**
 * Saves a new version on top of `baseVersion`. The row lock makes concurrent saves
 * queue up: each sees the version the one before it wrote, so exactly one save per
 * base version lands; the others get the current worksheet back as a conflict. A save
 * that finds the worksheet deleted (it waited for the delete's lock) gets 404, and the
 * answer is read inside the transaction, so a delete right after cannot empty it.
 */
export async function saveWorksheet(id: number, userId: number, body: { source: string; baseVersion: number; title?: string }): Promise<{ saved: Worksheet } | { conflict: Worksheet }> {
  return Worksheet.sequelize!.transaction(async (transaction) => {
    const current = await Worksheet.findByPk(id, { transaction, lock: Transaction.LOCK.UPDATE });
    if (!current) throw worksheetGone('while you were saving');
    if (current.version !== body.baseVersion) return { conflict: (await findWorksheetWithAuthor(id, transaction))! };
    const number = current.version + 1;
    const title = body.title ?? current.title;
    await current.update({ title, source: body.source, version: number, updatedById: userId }, { transaction });
    await WorksheetVersion.create({ worksheetId: id, number, title, source: body.source, authorId: userId }, { transaction });
    await recordActivity(Worksheet.sequelize!, { groupId: current.groupId, userId, action: 'saved worksheet', subject: `${title} v${number}`, worksheetId: id }, transaction);
    return { saved: (await findWorksheetWithAuthor(id, transaction))! };
  });
}

/** Deletes a worksheet once: a second delete (or one racing another) gets 404 and records nothing. */
export async function deleteWorksheet(worksheet: Worksheet, userId: number): Promise<void> {
  await Worksheet.sequelize!.transaction(async (transaction) => {
    const deleted = await Worksheet.destroy({ where: { id: worksheet.id }, transaction });
    if (!deleted) throw worksheetGone('just before you');
    await recordActivity(Worksheet.sequelize!, { groupId: worksheet.groupId, userId, action: 'deleted worksheet', subject: worksheet.title }, transaction);
  });
}

export const listVersions = (worksheetId: number) =>
  WorksheetVersion.findAll({ where: { worksheetId }, include: [{ model: User, as: 'author' }], order: [['number', 'DESC']] });

export const findVersion = (worksheetId: number, number: number) => WorksheetVersion.findOne({ where: { worksheetId, number } });
