import { Router, type Request, type Response } from 'express';
import { rateLimit } from 'express-rate-limit';
import { acceptInvitationBody, inviteBody, type InvitationDto, type InvitationPreviewDto } from '../../shared/collaboration.js';
import type { ServerConfig } from '../config.js';
import type { Mailer } from '../mail/mailer.js';
import { currentUser } from '../middleware/auth.js';
import { issueCsrfToken } from '../middleware/csrf.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { idParam, parseInput } from '../middleware/validate.js';
import type { Invitation, User } from '../models/index.js';
import { acceptInvitation, accountExists, invite, pendingInvitations, revokeInvitation, usableInvitation } from '../services/invitations.js';

const toDto = (i: Invitation): InvitationDto => ({
  id: i.id,
  email: i.email,
  role: i.role,
  invitedBy: i.invitedBy?.displayName ?? 'a former member',
  createdAt: i.createdAt.toISOString(),
  expiresAt: i.expiresAt.toISOString(),
});

/** Routes under /api/groups/:groupId/invitations (owners only). */
export function groupInvitationRoutes(config: ServerConfig, mailer: Mailer): Router {
  const router = Router({ mergeParams: true });
  const limiter = rateLimit({
    windowMs: 60 * 60_000,
    limit: 50,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    message: { error: { code: 'rate_limited', message: 'Too many invitations in the last hour. Wait a while and try again.' } },
  });

  router.get('/', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    const pending = await pendingInvitations(groupId);
    res.json({ invitations: pending.map(toDto) });
  });

  router.post('/', limiter, async (req, res) => {
    const user = currentUser(req);
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(user.id, groupId, 'manageMembers');
    const body = parseInput(inviteBody, req.body);
    const invitation = await invite({ groupId, inviter: user, email: body.email, role: body.role, mailer, linkBase: config.publicUrl });
    res.status(201).json({ invitation: toDto(invitation) });
  });

  router.delete('/:invitationId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    await revokeInvitation(groupId, idParam((req.params as Record<string, string>)['invitationId'], 'This invitation'));
    res.status(204).end();
  });

  return router;
}

function login(req: Request, res: Response, user: User) {
  return new Promise<void>((resolve, reject) =>
    req.login(user, (err) => {
      if (err) return reject(err);
      issueCsrfToken(req, res);
      resolve();
    }),
  );
}

/** Routes under /api/invitations/:token (no account needed to look). */
export function invitationRoutes(): Router {
  const router = Router();

  router.get('/:token', async (req, res) => {
    const invitation = await usableInvitation(String((req.params as Record<string, string>)['token']));
    const preview: InvitationPreviewDto = {
      groupName: invitation.group!.name,
      email: invitation.email,
      role: invitation.role,
      invitedBy: invitation.invitedBy?.displayName ?? 'a former member',
      expiresAt: invitation.expiresAt.toISOString(),
      accountExists: await accountExists(invitation.email),
    };
    res.json({ invitation: preview });
  });

  router.post('/:token/accept', async (req, res) => {
    const body = parseInput(acceptInvitationBody, req.body);
    const result = await acceptInvitation(String((req.params as Record<string, string>)['token']), (req.user as User | undefined) ?? null, body);
    if (!req.user) await login(req, res, result.user);
    res.status(result.created ? 201 : 200).json({ user: result.user.toDto(), groupId: result.groupId });
  });

  return router;
}
