import { Router } from 'express';
import { addMemberBody, changeMemberBody, type MemberDto } from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput } from '../middleware/validate.js';
import { Membership, User } from '../models/index.js';

const toDto = (m: Membership): MemberDto => ({
  userId: m.userId,
  email: m.user!.email,
  displayName: m.user!.displayName,
  role: m.role,
});

/** A group must keep at least one owner, or nobody could manage it again. */
async function assertNotLastOwner(groupId: number, membership: Membership) {
  if (membership.role !== 'owner') return;
  const owners = await Membership.count({ where: { groupId, role: 'owner' } });
  if (owners <= 1) throw new HttpError(409, 'last_owner', 'A group needs at least one owner. Make another member an owner first.');
}

export function memberRoutes(): Router {
  const router = Router({ mergeParams: true });

  router.get('/', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    const members = await Membership.findAll({ where: { groupId }, include: [{ model: User, as: 'user' }], order: [['createdAt', 'ASC']] });
    res.json({ members: members.map(toDto) });
  });

  router.post('/', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    const body = parseInput(addMemberBody, req.body);
    const user = await User.findOne({ where: { email: body.email } });
    if (!user) throw new HttpError(404, 'no_such_account', 'No account has this e-mail address. Ask the person to register first.');
    if (await Membership.findOne({ where: { groupId, userId: user.id } })) {
      throw new HttpError(409, 'already_member', 'This person is a member of the group already. Change their role instead.');
    }
    const membership = await Membership.create({ groupId, userId: user.id, role: body.role });
    membership.user = user;
    res.status(201).json({ member: toDto(membership) });
  });

  router.patch('/:userId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    const userId = idParam((req.params as Record<string, string>)['userId'], 'This member');
    const body = parseInput(changeMemberBody, req.body);
    const membership = await Membership.findOne({ where: { groupId, userId }, include: [{ model: User, as: 'user' }] });
    if (!membership) throw notFound('This member');
    if (body.role !== 'owner') await assertNotLastOwner(groupId, membership);
    await membership.update({ role: body.role });
    res.json({ member: toDto(membership) });
  });

  router.delete('/:userId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    const userId = idParam((req.params as Record<string, string>)['userId'], 'This member');
    const membership = await Membership.findOne({ where: { groupId, userId } });
    if (!membership) throw notFound('This member');
    await assertNotLastOwner(groupId, membership);
    await membership.destroy();
    res.status(204).end();
  });

  return router;
}
