/** Queries of a group's activity log (written by server/activity/record.ts). */
import { QueryTypes } from 'sequelize';
import { Group } from '../models/index.js';

/** Who did what, newest first, at most 200 lines. */
export const listActivity = (groupId: number) =>
  Group.sequelize!.query<{ id: number; action: string; subject: string; worksheet_id: number | null; created_at: Date; who: string | null }>(
    `SELECT a.id, a.action, a.subject, a.worksheet_id, a.created_at, u.display_name AS who
     FROM activity a LEFT JOIN users u ON u.id = a.user_id WHERE a.group_id = $1 ORDER BY a.created_at DESC, a.id DESC LIMIT 200`,
    { bind: [groupId], type: QueryTypes.SELECT },
  );
