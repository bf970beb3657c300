import { Router } from 'express';
import { addMemberBody, changeMemberBody, type MemberDto } from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { idParam, parseInput } from '../middleware/validate.js';
import type { Membership } from '../models/index.js';
import { addMember, changeMemberRole, listMembers, removeMember } from '../services/members.js';

const toDto = (m: Membership): MemberDto => ({
  userId: m.userId,
  email: m.user!.email,
  displayName: m.user!.displayName,
  role: m.role,
});

export function memberRoutes(): Router {
  const router = Router({ mergeParams: true });
  const groupOf = (params: unknown) => idParam((params as Record<string, string>)['groupId'], 'This group');
  const memberOf = (params: unknown) => idParam((params as Record<string, string>)['userId'], 'This member');

  router.get('/', async (req, res) => {
    const groupId = groupOf(req.params);
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    res.json({ members: (await listMembers(groupId)).map(toDto) });
  });

  router.post('/', async (req, res) => {
    const groupId = groupOf(req.params);
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    const body = parseInput(addMemberBody, req.body);
    res.status(201).json({ member: toDto(await addMember(groupId, body.email, body.role)) });
  });

  router.patch('/:userId', async (req, res) => {
    const groupId = groupOf(req.params);
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    const userId = memberOf(req.params);
    const body = parseInput(changeMemberBody, req.body);
    res.json({ member: toDto(await changeMemberRole(groupId, userId, body.role)) });
  });

  router.delete('/:userId', async (req, res) => {
    const groupId = groupOf(req.params);
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    await removeMember(groupId, memberOf(req.params));
    res.status(204).end();
  });

  return router;
}
