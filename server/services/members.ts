/** Queries of group memberships. */
import type { GroupRole } from '../../shared/api.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { Membership, User } from '../models/index.js';

/** A group must keep at least one owner, or nobody could manage it again. */
async function assertNotLastOwner(groupId: number, membership: Membership) {
  if (membership.role !== 'owner') return;
  const owners = await Membership.count({ where: { groupId, role: 'owner' } });
  if (owners <= 1) throw new HttpError(409, 'last_owner', 'A group needs at least one owner. Make another member an owner first.');
}

export const listMembers = (groupId: number) => Membership.findAll({ where: { groupId }, include: [{ model: User, as: 'user' }], order: [['createdAt', 'ASC']] });

/** Adds an existing account to a group. */
export async function addMember(groupId: number, email: string, role: GroupRole): Promise<Membership> {
  const user = await User.findOne({ where: { email } });
  if (!user) throw new HttpError(404, 'no_such_account', 'No account has this e-mail address. Ask the person to register first.');
  if (await Membership.findOne({ where: { groupId, userId: user.id } })) {
    throw new HttpError(409, 'already_member', 'This person is a member of the group already. Change their role instead.');
  }
  const membership = await Membership.create({ groupId, userId: user.id, role });
  membership.user = user;
  return membership;
}

export async function changeMemberRole(groupId: number, userId: number, role: GroupRole): Promise<Membership> {
  const membership = await Membership.findOne({ where: { groupId, userId }, include: [{ model: User, as: 'user' }] });
  if (!membership) throw notFound('This member');
  if (role !== 'owner') await assertNotLastOwner(groupId, membership);
  await membership.update({ role });
  return membership;
}

export async function removeMember(groupId: number, userId: number): Promise<void> {
  const membership = await Membership.findOne({ where: { groupId, userId } });
  if (!membership) throw notFound('This member');
  await assertNotLastOwner(groupId, membership);
  await membership.destroy();
}
