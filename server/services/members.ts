/** Queries of group memberships. */
import type { Transaction } from 'sequelize';
import { roleCan, type GroupRole } from '../../shared/api.js';
import { HttpError, forbidden, notFound } from '../middleware/http-error.js';
import { Membership, User } from '../models/index.js';

export const listMembers = (groupId: number) => Membership.findAll({ where: { groupId }, include: [{ model: User, as: 'user' }], order: [['createdAt', 'ASC']] });

const LAST_OWNER = 'A group needs at least one owner. Make another member an owner first.';

/**
 * Locks every membership of a group (SELECT … FOR UPDATE, in user order so that two
 * changes never wait on each other in a circle) and checks, under the lock, that the
 * caller may still manage members: a change that raced another one sees its outcome.
 */
async function lockForChange(groupId: number, actorId: number, transaction: Transaction): Promise<Membership[]> {
  const rows = await Membership.findAll({ where: { groupId }, order: [['userId', 'ASC']], lock: transaction.LOCK.UPDATE, transaction });
  const actor = rows.find((m) => m.userId === actorId);
  if (!actor) throw notFound('This group');
  if (!roleCan(actor.role, 'manageMembers')) throw forbidden();
  return rows;
}

const owners = (rows: Membership[]) => rows.filter((m) => m.role === 'owner').length;

/**
 * Changes a member's role. The owner count is checked and changed in one transaction
 * holding the group's membership rows, so two owners demoting each other at once
 * cannot leave the group without an owner: the second change sees the first.
 */
export function changeMemberRole(groupId: number, actorId: number, userId: number, role: GroupRole): Promise<Membership> {
  return Membership.sequelize!.transaction(async (transaction) => {
    const rows = await lockForChange(groupId, actorId, transaction);
    const membership = rows.find((m) => m.userId === userId);
    if (!membership) throw notFound('This member');
    if (membership.role === 'owner' && role !== 'owner' && owners(rows) <= 1) throw new HttpError(409, 'last_owner', LAST_OWNER);
    await membership.update({ role }, { transaction });
    membership.user = (await User.findByPk(userId, { transaction }))!;
    return membership;
  });
}

/** Removes a member (an owner removing themselves leaves the group), never the last owner. */
export function removeMember(groupId: number, actorId: number, userId: number): Promise<void> {
  return Membership.sequelize!.transaction(async (transaction) => {
    const rows = await lockForChange(groupId, actorId, transaction);
    const membership = rows.find((m) => m.userId === userId);
    if (!membership) throw notFound('This member');
    if (membership.role === 'owner' && owners(rows) <= 1) throw new HttpError(409, 'last_owner', LAST_OWNER);
    await membership.destroy({ transaction });
  });
}
