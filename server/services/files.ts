/** Queries of attachments (kept in PostgreSQL) and of imported worksheets. */
import { QueryTypes } from 'sequelize';
import { recordActivity } from '../activity/record.js';
import { Worksheet, type User } from '../models/index.js';

const q = <T extends object>(sql: string, bind: unknown[]) => Worksheet.sequelize!.query<T>(sql, { bind, type: QueryTypes.SELECT });

export const listAttachments = (worksheetId: number) =>
  q<{ id: number; file_name: string; media_type: string; size: number; created_at: Date; uploader: string | null }>(
    `SELECT a.id, a.file_name, a.media_type, a.size, a.created_at, u.display_name AS uploader
     FROM attachments a LEFT JOIN users u ON u.id = a.uploaded_by_id WHERE a.worksheet_id = $1 ORDER BY a.id`,
    [worksheetId],
  );

/** Stores a file (one statement: the row is stored whole or not at all) and records it. */
export async function addAttachment(o: { worksheet: Worksheet; user: User; name: string; type: string; content: Buffer }): Promise<number> {
  const [row] = await q<{ id: number }>(
    'INSERT INTO attachments (worksheet_id, file_name, media_type, size, content, uploaded_by_id) VALUES ($1, $2, $3, $4, $5, $6) RETURNING id',
    [o.worksheet.id, o.name, o.type, o.content.length, o.content, o.user.id],
  );
  await recordActivity(Worksheet.sequelize!, { groupId: o.worksheet.groupId, userId: o.user.id, action: 'attached file', subject: `${o.name} to ${o.worksheet.title}`, worksheetId: o.worksheet.id });
  return row!.id;
}

export const findAttachment = async (worksheetId: number, attachmentId: number) =>
  (await q<{ file_name: string; media_type: string; content: Buffer }>('SELECT file_name, media_type, content FROM attachments WHERE id = $1 AND worksheet_id = $2', [attachmentId, worksheetId]))[0];

export async function deleteAttachment(worksheetId: number, attachmentId: number): Promise<void> {
  await Worksheet.sequelize!.query('DELETE FROM attachments WHERE id = $1 AND worksheet_id = $2', { bind: [attachmentId, worksheetId] });
}
