/**
 * Queries of attachments, kept in PostgreSQL in chunks of at most 256 kB
 * (`attachment_chunks`): an upload is written and a download read one chunk at a time,
 * so no server process holds a whole file, and every server process sharing the
 * database sees the same files. A group's files together stay within its quota.
 */
import { createReadStream } from 'node:fs';
import { QueryTypes, type Transaction } from 'sequelize';
import { recordActivity } from '../activity/record.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { Worksheet, type User } from '../models/index.js';

export const CHUNK_BYTES = 256 * 1024;

const sequelize = () => Worksheet.sequelize!;
const q = <T extends object>(sql: string, bind: unknown[], transaction?: Transaction) =>
  sequelize().query<T>(sql, { bind, type: QueryTypes.SELECT, ...(transaction ? { transaction } : {}) });

export const listAttachments = (worksheetId: number) =>
  q<{ id: number; file_name: string; media_type: string; size: number; created_at: Date; uploader: string | null }>(
    `SELECT a.id, a.file_name, a.media_type, a.size, a.created_at, u.display_name AS uploader
     FROM attachments a LEFT JOIN users u ON u.id = a.uploaded_by_id WHERE a.worksheet_id = $1 ORDER BY a.id`,
    [worksheetId],
  );

/** The bytes a group's attached files take, over all its worksheets. */
export async function groupAttachmentBytes(groupId: number, transaction?: Transaction): Promise<number> {
  const [row] = await q<{ used: string }>(
    'SELECT coalesce(sum(a.size), 0) AS used FROM attachments a JOIN worksheets w ON w.id = a.worksheet_id WHERE w.group_id = $1',
    [groupId],
    transaction,
  );
  return Number(row?.used ?? 0);
}

const MB = 1024 * 1024;
/** "12 MB", "0.5 MB", "3.2 MB": sizes in the messages people read. */
export const megabytes = (bytes: number) => `${bytes >= 10 * MB || bytes % MB === 0 ? Math.round(bytes / MB) : (Math.round((bytes / MB) * 10) / 10 || 0.1)} MB`;

/** 413 with the figures: the quota, what is in use, and (when known) the file's size. */
export function quotaExceeded(o: { quota: number; used: number; size?: number }): HttpError {
  const left = Math.max(0, o.quota - o.used);
  const file = o.size === undefined ? `This file is larger than the ${megabytes(left)} left` : `This file (${megabytes(o.size)}) does not fit in the ${megabytes(left)} left`;
  return new HttpError(
    413,
    'quota_exceeded',
    `${file} of this group's ${megabytes(o.quota)} for attached files (${megabytes(o.used)} in use). Delete files the group no longer needs, or ask the site admin for a larger quota.`,
    { quota: { bytes: o.quota, usedBytes: o.used } },
  );
}

/** Locks a group's attachment quota until the transaction ends (two-key advisory lock: no row is touched). */
const QUOTA_LOCK = 0x53570001;
const lockGroupQuota = (groupId: number, transaction: Transaction) =>
  sequelize().query('SELECT pg_advisory_xact_lock($1, $2)', { bind: [QUOTA_LOCK, groupId], transaction });

/**
 * Stores a file from disk, chunk by chunk, in one transaction (the file is stored whole
 * or not at all), and records it. The worksheet is key-share locked, so it cannot be
 * deleted under the upload (a worksheet deleted before gives 404); the group's quota is
 * checked under a lock, so concurrent uploads cannot pass it together.
 */
export async function addAttachment(o: { worksheetId: number; user: User; name: string; type: string; path: string; size: number; quotaBytes: number }): Promise<number> {
  return sequelize().transaction(async (transaction) => {
    const [worksheet] = await q<{ group_id: number; title: string }>('SELECT group_id, title FROM worksheets WHERE id = $1 FOR KEY SHARE', [o.worksheetId], transaction);
    if (!worksheet) throw new HttpError(404, 'not_found', 'This worksheet was deleted while the file was uploading. Nothing was stored.');
    await lockGroupQuota(worksheet.group_id, transaction);
    const used = await groupAttachmentBytes(worksheet.group_id, transaction);
    if (used + o.size > o.quotaBytes) throw quotaExceeded({ quota: o.quotaBytes, used, size: o.size });
    const [row] = await q<{ id: number }>(
      'INSERT INTO attachments (worksheet_id, file_name, media_type, size, uploaded_by_id) VALUES ($1, $2, $3, $4, $5) RETURNING id',
      [o.worksheetId, o.name, o.type, o.size, o.user.id],
      transaction,
    );
    const id = row!.id;
    let seq = 0;
    let written = 0;
    for await (const chunk of createReadStream(o.path, { highWaterMark: CHUNK_BYTES })) {
      await sequelize().query('INSERT INTO attachment_chunks (attachment_id, seq, data) VALUES ($1, $2, $3)', { bind: [id, seq++, chunk], transaction });
      written += (chunk as Buffer).length;
    }
    if (written !== o.size) throw new HttpError(400, 'bad_upload', 'The file changed while it was stored. Send it again.');
    await recordActivity(sequelize(), { groupId: worksheet.group_id, userId: o.user.id, action: 'attached file', subject: `${o.name} to ${worksheet.title}`, worksheetId: o.worksheetId }, transaction);
    return id;
  });
}

export const findAttachment = async (worksheetId: number, attachmentId: number) =>
  (await q<{ id: number; file_name: string; media_type: string; size: number }>('SELECT id, file_name, media_type, size FROM attachments WHERE id = $1 AND worksheet_id = $2', [attachmentId, worksheetId]))[0];

/** A stored file's bytes, one chunk per query (ends early when the file is deleted meanwhile). */
export async function* attachmentContent(attachmentId: number): AsyncGenerator<Buffer> {
  for (let seq = 0; ; seq++) {
    const [row] = await q<{ data: Buffer }>('SELECT data FROM attachment_chunks WHERE attachment_id = $1 AND seq = $2', [attachmentId, seq]);
    if (!row) return;
    yield row.data;
  }
}

/** Deletes a file; 404 when there is none (already deleted by someone else, or never there). */
export async function deleteAttachment(worksheetId: number, attachmentId: number): Promise<void> {
  const deleted = await q<{ id: number }>('DELETE FROM attachments WHERE id = $1 AND worksheet_id = $2 RETURNING id', [attachmentId, worksheetId]);
  if (!deleted.length) throw notFound('This file');
}
