import { Router, type Request, type Response } from 'express';
import { sharedRateLimit } from '../middleware/shared-rate-limit.js';
import { acceptInvitationBody, inviteBody, type InvitationDto, type InvitationPreviewDto } from '../../shared/collaboration.js';
import type { ServerConfig } from '../config.js';
import type { Mailer } from '../mail/mailer.js';
import { currentUser } from '../middleware/auth.js';
import { issueCsrfToken } from '../middleware/csrf.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { idParam, parseInput } from '../middleware/validate.js';
import { HttpError } from '../middleware/http-error.js';
import type { Invitation, User } from '../models/index.js';
import type { SignInService } from '../auth/sign-in.js';
import { acceptInvitation, accountExists, assertInvitedAddress, invite, pendingInvitations, revokeInvitation, usableInvitation, type Acceptor } from '../services/invitations.js';

export const invitationDto = (i: Invitation): InvitationDto => ({
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
  const limiter = sharedRateLimit('group-invite', 60 * 60_000, 50, 'Too many invitations in the last hour. Wait a while and try again.');

  router.get('/', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    const pending = await pendingInvitations(groupId);
    res.json({ invitations: pending.map(invitationDto) });
  });

  router.post('/', limiter, async (req, res) => {
    const user = currentUser(req);
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(user.id, groupId, 'manageMembers');
    const body = parseInput(inviteBody, req.body);
    const invitation = await invite({ groupId, inviter: user, email: body.email, role: body.role, mailer, linkBase: config.publicUrl });
    res.status(201).json({ invitation: invitationDto(invitation) });
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
export function invitationRoutes(signIn: SignInService): Router {
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

  // Only the invited address joins: signed in as it, signed in here with its password
  // (through the same back-off as the sign-in form, so a lock is not bypassed), or as a
  // new account for it. Another signed-in account is told the invitation is not theirs.
  router.post('/:token/accept', async (req, res) => {
    const body = parseInput(acceptInvitationBody, req.body);
    const token = String((req.params as Record<string, string>)['token']);
    const invitation = await usableInvitation(token);
    const signedIn = (req.user as User | undefined) ?? null;
    let acceptor: Acceptor;
    if (signedIn) {
      assertInvitedAddress(invitation, signedIn);
      acceptor = { user: signedIn };
    } else if (await accountExists(invitation.email)) {
      if (!body.password) throw new HttpError(401, 'bad_credentials', `Enter the password of the account ${invitation.email} to accept.`);
      const user = await signIn.authenticate(invitation.email, body.password, req.ip).catch((err) => {
        if (typeof err?.extra?.retryAfter === 'number') res.set('Retry-After', String(err.extra.retryAfter));
        if (err?.code === 'bad_credentials') throw new HttpError(401, 'bad_credentials', `The password is wrong. Enter the password of the account ${invitation.email} to accept.`);
        throw err;
      });
      acceptor = { user };
    } else {
      acceptor = { newAccount: body };
    }
    const result = await acceptInvitation(token, acceptor);
    if (!signedIn) {
      if (result.created) await signIn.remember(result.user, req.ip);
      await login(req, res, result.user);
    }
    res.status(result.created ? 201 : 200).json({ user: result.user.toDto(), groupId: result.groupId });
  });

  return router;
}
