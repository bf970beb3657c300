import { Router } from 'express';
import { sharedRateLimit } from '../middleware/shared-rate-limit.js';
import { addMemberBody, changeMemberBody, type MemberDto } from '../../shared/api.js';
import type { ServerConfig } from '../config.js';
import type { Mailer } from '../mail/mailer.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { idParam, parseInput } from '../middleware/validate.js';
import type { Membership } from '../models/index.js';
import { invite } from '../services/invitations.js';
import { changeMemberRole, listMembers, removeMember } from '../services/members.js';
import { invitationDto } from './invitations.js';

const toDto = (m: Membership): MemberDto => ({
  userId: m.userId,
  email: m.user!.email,
  displayName: m.user!.displayName,
  role: m.role,
});

export function memberRoutes(config: ServerConfig, mailer: Mailer): Router {
  const router = Router({ mergeParams: true });
  const groupOf = (params: unknown) => idParam((params as Record<string, string>)['groupId'], 'This group');
  const memberOf = (params: unknown) => idParam((params as Record<string, string>)['userId'], 'This member');
  const limiter = sharedRateLimit('members-invite', 60 * 60_000, 50, 'Too many invitations in the last hour. Wait a while and try again.');

  router.get('/', async (req, res) => {
    const groupId = groupOf(req.params);
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    res.json({ members: (await listMembers(groupId)).map(toDto) });
  });

  // Members join by invitation only: adding an address mails it an invitation, and the
  // answer is the same whether or not the address has an account (nothing to enumerate,
  // and nobody joins a group without saying yes).
  router.post('/', limiter, async (req, res) => {
    const user = currentUser(req);
    const groupId = groupOf(req.params);
    await requireGroupRole(user.id, groupId, 'manageMembers');
    const body = parseInput(addMemberBody, req.body);
    const invitation = await invite({ groupId, inviter: user, email: body.email, role: body.role, mailer, linkBase: config.publicUrl });
    res.status(202).json({
      invitation: invitationDto(invitation),
      message: `We sent an invitation to ${invitation.email}. They join as ${invitation.role} when they accept it.`,
    });
  });

  // Role checks happen again inside the service's transaction, under the group's row locks.
  router.patch('/:userId', async (req, res) => {
    const actor = currentUser(req);
    const groupId = groupOf(req.params);
    await requireGroupRole(actor.id, groupId, 'manageMembers');
    const userId = memberOf(req.params);
    const body = parseInput(changeMemberBody, req.body);
    res.json({ member: toDto(await changeMemberRole(groupId, actor.id, userId, body.role)) });
  });

  router.delete('/:userId', async (req, res) => {
    const actor = currentUser(req);
    const groupId = groupOf(req.params);
    await requireGroupRole(actor.id, groupId, 'manageMembers');
    await removeMember(groupId, actor.id, memberOf(req.params));
    res.status(204).end();
  });

  return router;
}
