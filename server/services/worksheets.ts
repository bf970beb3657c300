/** Queries of worksheets and their versions. */
import { Op, Transaction } from 'sequelize';
import type { WorksheetListQuery } from '../../shared/api.js';
import { recordActivity } from '../activity/record.js';
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

export const findWorksheetWithAuthor = async (id: number) => (await Worksheet.findByPk(id, withAuthor))!;

/**
 * Saves a new version on top of `baseVersion`. The row lock makes concurrent saves
 * queue up: each sees the version the one before it wrote, so exactly one save per
 * base version lands; the others get the current worksheet back as a conflict.
 */
export async function saveWorksheet(id: number, userId: number, body: { source: string; baseVersion: number; title?: string }): Promise<{ saved: Worksheet } | { conflict: Worksheet }> {
  const outcome = await Worksheet.sequelize!.transaction(async (transaction) => {
    const current = (await Worksheet.findByPk(id, { transaction, lock: Transaction.LOCK.UPDATE }))!;
    if (current.version !== body.baseVersion) return 'conflict' as const;
    const number = current.version + 1;
    const title = body.title ?? current.title;
    await current.update({ title, source: body.source, version: number, updatedById: userId }, { transaction });
    await WorksheetVersion.create({ worksheetId: id, number, title, source: body.source, authorId: userId }, { transaction });
    await recordActivity(Worksheet.sequelize!, { groupId: current.groupId, userId, action: 'saved worksheet', subject: `${title} v${number}`, worksheetId: id }, transaction);
    return 'saved' as const;
  });
  const worksheet = await findWorksheetWithAuthor(id);
  return outcome === 'saved' ? { saved: worksheet } : { conflict: worksheet };
}

export async function deleteWorksheet(worksheet: Worksheet, userId: number): Promise<void> {
  await Worksheet.sequelize!.transaction(async (transaction) => {
    await worksheet.destroy({ transaction });
    await recordActivity(Worksheet.sequelize!, { groupId: worksheet.groupId, userId, action: 'deleted worksheet', subject: worksheet.title }, transaction);
  });
}

export const listVersions = (worksheetId: number) =>
  WorksheetVersion.findAll({ where: { worksheetId }, include: [{ model: User, as: 'author' }], order: [['number', 'DESC']] });

export const findVersion = (worksheetId: number, number: number) => WorksheetVersion.findOne({ where: { worksheetId, number } });
