/** Queries of worksheets and their versions. */
import { ForeignKeyConstraintError, Op, QueryTypes, Transaction } from 'sequelize';
import type { GroupRole, WorksheetListQuery } from '../../shared/api.js';
import { AUTO_VERSION_MINUTES, type DraftDto, type MilestoneCheckDto } from '../../shared/versions-api.js';
import { parseSource } from '../evaluation/parse-source.js';
import { statementReviews } from './reviews.js';
import { recordActivity } from '../activity/record.js';
import { HttpError } from '../middleware/http-error.js';
import { User, Worksheet, WorksheetVersion } from '../models/index.js';
import type { VersionKind } from '../models/worksheet-version.js';

export const withAuthor = { include: [{ model: User, as: 'updatedBy' }] };

const likePattern = (search: string) => {
  let escaped = '';
  for (const ch of search) escaped += ch === '\\' || ch === '%' || ch === '_' ? `\\${ch}` : ch;
  return `%${escaped}%`;
};

const LIST_ORDER: Record<WorksheetListQuery['sort'], string> = { title: 'w.title', updatedAt: 'w.updated_at', version: 'w.version' };

interface ListRow {
  role: GroupRole;
  id: number | null;
  title: string;
  version: number;
  updated_at: Date;
  display_name: string | null;
  total: string | null;
}

export interface WorksheetListItem {
  id: number;
  title: string;
  version: number;
  updatedAt: Date;
  updatedBy: string | null;
}

/**
 * The caller's role in the group and one page of its worksheets with their count, in one
 * query (the count by a window over the filtered rows, before the page is cut). Null when
 * the caller is not a member. Only a page past the end (no row to carry the count) asks
 * for the count separately.
 */
export async function listWorksheetsForMember(
  userId: number,
  groupId: number,
  query: WorksheetListQuery,
): Promise<{ role: GroupRole; rows: WorksheetListItem[]; count: number } | null> {
  const dir = query.direction === 'asc' ? 'ASC' : 'DESC';
  const order = `${LIST_ORDER[query.sort]} ${dir}, w.id ASC`;
  const bind: unknown[] = [groupId, userId, query.search ? likePattern(query.search) : null, query.pageSize, query.page * query.pageSize];
  const rows = await Worksheet.sequelize!.query<ListRow>(
    `SELECT m.role, w.id, w.title, w.version, w.updated_at, w.display_name, w.total
       FROM memberships m
       LEFT JOIN LATERAL (
         SELECT w.id, w.title, w.version, w.updated_at, u.display_name, COUNT(*) OVER () AS total
           FROM worksheets w LEFT JOIN users u ON u.id = w.updated_by_id
          WHERE w.group_id = m.group_id AND ($3::text IS NULL OR w.title ILIKE $3)
          ORDER BY ${order}
          LIMIT $4 OFFSET $5
       ) w ON true
      WHERE m.group_id = $1 AND m.user_id = $2
      ORDER BY ${order}`,
    { bind, type: QueryTypes.SELECT },
  );
  if (!rows.length) return null;
  const role = rows[0]!.role;
  const items = rows
    .filter((r) => r.id !== null)
    .map((r) => ({ id: r.id!, title: r.title, version: r.version, updatedAt: new Date(r.updated_at), updatedBy: r.display_name }));
  const count = items.length
    ? Number(rows[0]!.total)
    : await Worksheet.count({ where: { groupId, ...(query.search ? { title: { [Op.iLike]: likePattern(query.search) } } : {}) } });
  return { role, rows: items, count };
}

/** A new worksheet with its version 1, recorded in the group's activity. */
export async function createWorksheet(o: { groupId: number; user: User; title: string; source: string; action: 'created worksheet' | 'imported worksheet' }): Promise<Worksheet> {
  const worksheet = await Worksheet.sequelize!.transaction(async (transaction) => {
    const created = await Worksheet.create({ groupId: o.groupId, title: o.title, source: o.source, updatedById: o.user.id }, { transaction });
    await WorksheetVersion.create({ worksheetId: created.id, number: 1, title: o.title, source: o.source, authorId: o.user.id, kind: 'created' }, { transaction });
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
 * Saves a new version (a checkpoint) on top of `baseVersion`. The row lock makes
 * concurrent saves queue up: each sees the version the one before it wrote, so exactly
 * one save per base version lands; the others get the current worksheet back as a
 * conflict. A save that finds the worksheet deleted (it waited for the delete's lock)
 * gets 404, and the answer is read inside the transaction, so a delete right after
 * cannot empty it. The saver's draft of the same text is used up by the checkpoint.
 */
export async function saveWorksheet(
  id: number,
  userId: number,
  body: { source: string; baseVersion: number; title?: string; name?: string; restoredFrom?: number },
): Promise<{ saved: Worksheet } | { conflict: Worksheet }> {
  return Worksheet.sequelize!.transaction(async (transaction) => {
    const current = await Worksheet.findByPk(id, { transaction, lock: Transaction.LOCK.UPDATE });
    if (!current) throw worksheetGone('while you were saving');
    if (current.version !== body.baseVersion) return { conflict: (await findWorksheetWithAuthor(id, transaction))! };
    const kind: VersionKind = body.restoredFrom ? 'restored' : 'saved';
    const number = await writeVersion(current, { userId, title: body.title ?? current.title, source: body.source, name: body.name || null, kind }, transaction);
    const label = body.name ? ` “${body.name}”` : body.restoredFrom ? ` (v${body.restoredFrom} restored)` : '';
    await recordActivity(Worksheet.sequelize!, { groupId: current.groupId, userId, action: 'saved worksheet', subject: `${current.title} v${number}${label}`, worksheetId: id }, transaction);
    await Worksheet.sequelize!.query('DELETE FROM worksheet_drafts WHERE worksheet_id = $1 AND user_id = $2 AND source = $3', { bind: [id, userId, body.source], transaction });
    return { saved: (await findWorksheetWithAuthor(id, transaction))! };
  });
}

/** The next version of a worksheet whose row the caller holds locked. */
async function writeVersion(current: Worksheet, v: { userId: number; title: string; source: string; name: string | null; kind: VersionKind }, transaction: Transaction): Promise<number> {
  const number = current.version + 1;
  await current.update({ title: v.title, source: v.source, version: number, updatedById: v.userId }, { transaction });
  await WorksheetVersion.create({ worksheetId: current.id, number, title: v.title, source: v.source, authorId: v.userId, name: v.name, kind: v.kind }, { transaction });
  return number;
}

interface DraftRow {
  title: string;
  source: string;
  base_version: number;
  started_at: Date;
  updated_at: Date;
  auto_due?: boolean;
}

const draftDto = (r: DraftRow): DraftDto => ({
  title: r.title,
  source: r.source,
  baseVersion: r.base_version,
  startedAt: new Date(r.started_at).toISOString(),
  updatedAt: new Date(r.updated_at).toISOString(),
});

/** The caller's draft of a worksheet, or null. */
export async function findDraft(worksheetId: number, userId: number): Promise<DraftDto | null> {
  const rows = await Worksheet.sequelize!.query<DraftRow>('SELECT title, source, base_version, started_at, updated_at FROM worksheet_drafts WHERE worksheet_id = $1 AND user_id = $2', {
    bind: [worksheetId, userId],
    type: QueryTypes.SELECT,
  });
  return rows[0] ? draftDto(rows[0]) : null;
}

export async function discardDraft(worksheetId: number, userId: number): Promise<void> {
  await Worksheet.sequelize!.query('DELETE FROM worksheet_drafts WHERE worksheet_id = $1 AND user_id = $2', { bind: [worksheetId, userId] });
}

/**
 * Keeps the caller's draft (no version, no activity line). The draft's editing time
 * starts when it first differs from the version it is based on. When the draft is on
 * top of the latest version, has been edited for AUTO_VERSION_MINUTES and no version of
 * the worksheet was made in that time, it becomes an automatic version (kind 'auto'),
 * so a long session keeps at most one automatic version per ten minutes. Times are the
 * database's, so every server process agrees. A draft equal to its base is removed.
 */
export async function saveDraft(
  id: number,
  userId: number,
  body: { title: string; source: string; baseVersion: number },
): Promise<{ draft: DraftDto | null; head: Worksheet; autoVersion: number | null }> {
  const sequelize = Worksheet.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const current = await Worksheet.findByPk(id, { transaction, lock: Transaction.LOCK.UPDATE });
    if (!current) throw worksheetGone('while your draft was being kept');
    if (body.source === current.source && body.title === current.title && body.baseVersion === current.version) {
      await sequelize.query('DELETE FROM worksheet_drafts WHERE worksheet_id = $1 AND user_id = $2', { bind: [id, userId], transaction });
      return { draft: null, head: (await findWorksheetWithAuthor(id, transaction))!, autoVersion: null };
    }
    const [row] = await sequelize.query<DraftRow>(
      `INSERT INTO worksheet_drafts AS d (worksheet_id, user_id, title, source, base_version)
       VALUES ($1, $2, $3, $4, $5)
       ON CONFLICT (worksheet_id, user_id) DO UPDATE SET
         title = EXCLUDED.title, source = EXCLUDED.source, updated_at = now(),
         started_at = CASE WHEN d.base_version = EXCLUDED.base_version THEN d.started_at ELSE now() END,
         base_version = EXCLUDED.base_version
       RETURNING title, source, base_version, started_at, updated_at,
         now() - started_at >= make_interval(mins => $6)
         AND NOT EXISTS (SELECT 1 FROM worksheet_versions v WHERE v.worksheet_id = $1 AND v.created_at > now() - make_interval(mins => $6)) AS auto_due`,
      { bind: [id, userId, body.title, body.source, body.baseVersion, AUTO_VERSION_MINUTES], type: QueryTypes.SELECT, transaction },
    );
    if (row!.auto_due && body.baseVersion === current.version) {
      const number = await writeVersion(current, { userId, title: body.title, source: body.source, name: null, kind: 'auto' }, transaction);
      await sequelize.query('DELETE FROM worksheet_drafts WHERE worksheet_id = $1 AND user_id = $2', { bind: [id, userId], transaction });
      return { draft: null, head: (await findWorksheetWithAuthor(id, transaction))!, autoVersion: number };
    }
    return { draft: draftDto(row!), head: (await findWorksheetWithAuthor(id, transaction))!, autoVersion: null };
  });
}

/** The latest version's number, title and author, without the source: what an open window polls. */
export const findHead = (id: number) => Worksheet.findByPk(id, { attributes: ['id', 'groupId', 'title', 'version', 'updatedAt', 'updatedById'], ...withAuthor });

/**
 * Each result of a version (the statements a review can confirm, parameter lines aside)
 * and its review state against that version's text; ready when every one is confirmed.
 */
export async function milestoneCheck(worksheetId: number, version: WorksheetVersion): Promise<MilestoneCheckDto> {
  const paramLines = new Set((parseSource(version.source)?.lines ?? []).flatMap((l) => (l.ok && l.statement.kind === 'param' ? [l.line] : [])));
  const reviewed = await statementReviews(worksheetId, version.source);
  const results = reviewed.filter((s) => !paramLines.has(s.line)).map((s) => ({ key: s.key, line: s.line, status: s.status }));
  return { version: version.number, ready: results.length > 0 && results.every((r) => r.status === 'confirmed'), results };
}

/** Signs a version off as a milestone, once; answers the check when it is not ready (nothing is written then). */
export async function signOffMilestone(worksheet: Worksheet, number: number, userId: number): Promise<{ version: WorksheetVersion } | { notReady: MilestoneCheckDto } | null> {
  return Worksheet.sequelize!.transaction(async (transaction) => {
    const version = await WorksheetVersion.findOne({ where: { worksheetId: worksheet.id, number }, transaction, lock: Transaction.LOCK.UPDATE });
    if (!version) return null;
    if (version.milestoneAt) return { version };
    const check = await milestoneCheck(worksheet.id, version);
    if (!check.ready) return { notReady: check };
    await version.update({ milestoneAt: new Date(), milestoneById: userId }, { transaction });
    await recordActivity(Worksheet.sequelize!, { groupId: worksheet.groupId, userId, action: 'confirmed', subject: `${version.title} v${number} as a milestone`, worksheetId: worksheet.id }, transaction);
    return { version };
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

/** Display names of the people who signed milestones off, by id. */
export async function milestoneSigners(versions: WorksheetVersion[]): Promise<Map<number, string>> {
  const ids = [...new Set(versions.flatMap((v) => (v.milestoneById ? [v.milestoneById] : [])))];
  if (!ids.length) return new Map();
  return new Map((await User.findAll({ where: { id: ids } })).map((u) => [u.id, u.displayName]));
}

export const findVersion = (worksheetId: number, number: number) => WorksheetVersion.findOne({ where: { worksheetId, number } });
