/** Queries of referee links: read-only links to one frozen version. Only a token's hash is kept. */
import { QueryTypes } from 'sequelize';
import { recordActivity } from '../activity/record.js';
import { WorksheetVersion, type Worksheet } from '../models/index.js';

const q = <T extends object>(sql: string, bind: unknown[]) => WorksheetVersion.sequelize!.query<T>(sql, { bind, type: QueryTypes.SELECT });

export const findVersion = (worksheetId: number, number: number) => WorksheetVersion.findOne({ where: { worksheetId, number } });

export async function createRefereeLink(o: { worksheet: Worksheet; version: number; tokenHash: string; userId: number; days: number }) {
  const [row] = await q<{ id: number; expires_at: Date }>(
    `INSERT INTO referee_links (worksheet_id, version, token_hash, created_by_id, expires_at) VALUES ($1, $2, $3, $4, now() + make_interval(days => $5)) RETURNING id, expires_at`,
    [o.worksheet.id, o.version, o.tokenHash, o.userId, o.days],
  );
  await recordActivity(WorksheetVersion.sequelize!, { groupId: o.worksheet.groupId, userId: o.userId, action: 'created referee link', subject: `${o.worksheet.title} v${o.version}`, worksheetId: o.worksheet.id });
  return row!;
}

export const listRefereeLinks = (worksheetId: number) =>
  q<{ id: number; version: number; expires_at: Date; revoked_at: Date | null; created_at: Date }>(
    'SELECT id, version, expires_at, revoked_at, created_at FROM referee_links WHERE worksheet_id = $1 ORDER BY id DESC',
    [worksheetId],
  );

export async function revokeRefereeLink(worksheet: Worksheet, linkId: number, userId: number): Promise<void> {
  await q('UPDATE referee_links SET revoked_at = now() WHERE id = $1 AND worksheet_id = $2 AND revoked_at IS NULL RETURNING id', [linkId, worksheet.id]);
  await recordActivity(WorksheetVersion.sequelize!, { groupId: worksheet.groupId, userId, action: 'revoked referee link', subject: worksheet.title, worksheetId: worksheet.id });
}

export const findRefereeLink = async (tokenHash: string) =>
  (await q<{ id: number; worksheet_id: number; version: number; expires_at: Date; revoked_at: Date | null }>('SELECT id, worksheet_id, version, expires_at, revoked_at FROM referee_links WHERE token_hash = $1', [tokenHash]))[0];
