import { QueryTypes, type Transaction } from 'sequelize';
import type { Sequelize } from 'sequelize';

export const ACTIVITY_ACTIONS = [
  'created worksheet', 'saved worksheet', 'deleted worksheet', 'imported worksheet', 'requested review', 'confirmed', 'disputed',
  'commented', 'invited', 'exported', 'attached file', 'created referee link', 'revoked referee link',
] as const;
export type ActivityAction = (typeof ACTIVITY_ACTIONS)[number];

/** Writes one line of a group's activity: who did what to which thing. */
export async function recordActivity(
  sequelize: Sequelize,
  entry: { groupId: number; userId: number | null; action: ActivityAction; subject: string; worksheetId?: number | null },
  transaction?: Transaction,
): Promise<void> {
  await sequelize.query('INSERT INTO activity (group_id, user_id, action, subject, worksheet_id) VALUES ($1, $2, $3, $4, $5)', {
    bind: [entry.groupId, entry.userId, entry.action, entry.subject, entry.worksheetId ?? null],
    type: QueryTypes.INSERT,
    transaction,
  });
}
