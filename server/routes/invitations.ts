import { Router, type Request, type Response } from 'express';
import { rateLimit } from 'express-rate-limit';
import { Op } from 'sequelize';
import {
  acceptInvitationBody,
  INVITATION_DAYS,
  inviteBody,
  type InvitationDto,
  type InvitationPreviewDto,
} from '../../shared/collaboration.js';
import { checkPassword, hashPassword } from '../auth/password.js';
import { hashToken, newToken } from '../auth/tokens.js';
import type { ServerConfig } from '../config.js';
import type { Mailer } from '../mail/mailer.js';
import { invitationMail } from '../mail/templates.js';
import { currentUser } from '../middleware/auth.js';
import { issueCsrfToken } from '../middleware/csrf.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput } from '../middleware/validate.js';
import { Group, Invitation, Membership, User } from '../models/index.js';
import { LIMITS } from '../../shared/api.js';
import { recordActivity } from '../activity/record.js';

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
    const pending = await Invitation.findAll({
      where: { groupId, acceptedAt: null, revokedAt: null, expiresAt: { [Op.gt]: new Date() } },
      include: [{ model: User, as: 'invitedBy' }],
      order: [['createdAt', 'DESC']],
    });
    res.json({ invitations: pending.map(toDto) });
  });

  router.post('/', limiter, async (req, res) => {
    const user = currentUser(req);
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(user.id, groupId, 'manageMembers');
    const body = parseInput(inviteBody, req.body);
    const existing = await User.findOne({ where: { email: body.email } });
    if (existing && (await Membership.findOne({ where: { groupId, userId: existing.id } }))) {
      throw new HttpError(409, 'already_member', `${body.email} is a member of this group already. Change their role in the member list instead.`);
    }
    const group = (await Group.findByPk(groupId))!;
    const { token, hash } = newToken();
    const invitation = await Invitation.sequelize!.transaction(async (transaction) => {
      const created = await Invitation.create(
        { groupId, email: body.email, role: body.role, tokenHash: hash, invitedById: user.id, expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000) },
        { transaction },
      );
      await mailer.send(
        invitationMail({ to: body.email, groupName: group.name, role: body.role, inviter: user.displayName, link: `${config.publicUrl}/invitations/${token}`, days: INVITATION_DAYS }),
        { transaction },
      );
      await recordActivity(Invitation.sequelize!, { groupId, userId: user.id, action: 'invited', subject: `${body.email} as ${body.role}` }, transaction);
      return created;
    });
    invitation.invitedBy = user;
    res.status(201).json({ invitation: toDto(invitation) });
  });

  router.delete('/:invitationId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageMembers');
    const invitation = await Invitation.findOne({ where: { id: idParam((req.params as Record<string, string>)['invitationId'], 'This invitation'), groupId } });
    if (!invitation) throw notFound('This invitation');
    await invitation.update({ revokedAt: new Date() });
    res.status(204).end();
  });

  return router;
}

/** Finds a usable invitation by its token, or says plainly why it cannot be used. */
async function usableInvitation(token: string): Promise<Invitation> {
  if (token.length > 200) throw notFound('This invitation');
  const invitation = await Invitation.findOne({
    where: { tokenHash: hashToken(token) },
    include: [
      { model: User, as: 'invitedBy' },
      { model: Group, as: 'group' },
    ],
  });
  if (!invitation || !invitation.group) throw new HttpError(404, 'invitation_unknown', 'This invitation link is not valid. Ask the group owner for a new one.');
  if (invitation.acceptedAt) throw new HttpError(410, 'invitation_used', 'This invitation was used already. Sign in to reach the group, or ask the owner for a new one.');
  if (invitation.revokedAt) throw new HttpError(410, 'invitation_revoked', 'This invitation was withdrawn. Ask the group owner for a new one.');
  if (invitation.expiresAt.getTime() <= Date.now()) throw new HttpError(410, 'invitation_expired', 'This invitation has expired. Ask the group owner for a new one.');
  return invitation;
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
      accountExists: (await User.count({ where: { email: invitation.email } })) > 0,
    };
    res.json({ invitation: preview });
  });

  router.post('/:token/accept', async (req, res) => {
    const body = parseInput(acceptInvitationBody, req.body);
    const result = await Invitation.sequelize!.transaction(async (transaction) => {
      // Locked so that two clicks on one link cannot both use it.
      const found = await usableInvitation(String((req.params as Record<string, string>)['token']));
      const invitation = (await Invitation.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
      if (invitation.acceptedAt) throw new HttpError(410, 'invitation_used', 'This invitation was used already.');
      let user: User | null = (req.user as User | undefined) ?? null;
      let created = false;
      if (!user) {
        user = await User.findOne({ where: { email: invitation.email }, transaction });
        if (user) {
          if (!body.password || !(await checkPassword(body.password, user.passwordHash))) {
            throw new HttpError(401, 'bad_credentials', `Enter the password of the account ${invitation.email} to accept.`);
          }
        } else {
          if (!body.displayName) throw new HttpError(400, 'invalid_input', 'displayName: Enter a display name.');
          if (!body.password || body.password.length < LIMITS.passwordMin) {
            throw new HttpError(400, 'invalid_input', `password: Use a password of at least ${LIMITS.passwordMin} characters.`);
          }
          user = await User.create({ email: invitation.email, displayName: body.displayName, passwordHash: await hashPassword(body.password) }, { transaction });
          created = true;
        }
      }
      if (user.disabled) throw new HttpError(403, 'account_disabled', 'This account is disabled. Ask the site admin to enable it.');
      const already = await Membership.findOne({ where: { groupId: invitation.groupId, userId: user.id }, transaction });
      if (!already) await Membership.create({ groupId: invitation.groupId, userId: user.id, role: invitation.role }, { transaction });
      await invitation.update({ acceptedAt: new Date() }, { transaction });
      return { user, created, groupId: invitation.groupId };
    });
    if (!req.user) await login(req, res, result.user);
    res.status(result.created ? 201 : 200).json({ user: result.user.toDto(), groupId: result.groupId });
  });

  return router;
}
