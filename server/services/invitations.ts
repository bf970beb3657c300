/** Queries of invitations: sending, withdrawing, looking at and accepting them. */
import { Op, UniqueConstraintError } from 'sequelize';
import { INVITATION_DAYS } from '../../shared/collaboration.js';
import type { GroupRole } from '../../shared/api.js';
import { recordActivity } from '../activity/record.js';
import { hashPassword } from '../auth/password.js';
import { assertPasswordAllowed } from '../auth/password-policy.js';
import { normaliseEmail } from '../auth/throttle.js';
import { hashToken, newToken } from '../auth/tokens.js';
import type { Mailer } from '../mail/mailer.js';
import { invitationMail } from '../mail/templates.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { Group, Invitation, Membership, User } from '../models/index.js';
import { emailTakenOnRace } from './users.js';

export const pendingInvitations = (groupId: number) =>
  Invitation.findAll({
    where: { groupId, acceptedAt: null, revokedAt: null, expiresAt: { [Op.gt]: new Date() } },
    include: [{ model: User, as: 'invitedBy' }],
    order: [['createdAt', 'DESC']],
  });

/** Creates an invitation and queues its mail in one transaction; the token is only in the mail. */
export async function invite(o: { groupId: number; inviter: User; email: string; role: GroupRole; mailer: Mailer; linkBase: string }): Promise<Invitation> {
  const existing = await User.findOne({ where: { email: o.email } });
  if (existing && (await Membership.findOne({ where: { groupId: o.groupId, userId: existing.id } }))) {
    throw new HttpError(409, 'already_member', `${o.email} is a member of this group already. Change their role in the member list instead.`);
  }
  const group = (await Group.findByPk(o.groupId))!;
  const { token, hash } = newToken();
  const invitation = await Invitation.sequelize!.transaction(async (transaction) => {
    const created = await Invitation.create(
      { groupId: o.groupId, email: o.email, role: o.role, tokenHash: hash, invitedById: o.inviter.id, expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000) },
      { transaction },
    );
    await o.mailer.send(
      invitationMail({ to: o.email, groupName: group.name, role: o.role, inviter: o.inviter.displayName, link: `${o.linkBase}/invitations/${token}`, days: INVITATION_DAYS }),
      { transaction },
    );
    await recordActivity(Invitation.sequelize!, { groupId: o.groupId, userId: o.inviter.id, action: 'invited', subject: `${o.email} as ${o.role}` }, transaction);
    return created;
  });
  invitation.invitedBy = o.inviter;
  return invitation;
}

export async function revokeInvitation(groupId: number, invitationId: number): Promise<void> {
  const invitation = await Invitation.findOne({ where: { id: invitationId, groupId } });
  if (!invitation) throw notFound('This invitation');
  await invitation.update({ revokedAt: new Date() });
}

/** Finds a usable invitation by its token, or says plainly why it cannot be used. */
export async function usableInvitation(token: string): Promise<Invitation> {
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

export const accountExists = async (email: string) => (await User.count({ where: { email } })) > 0;

/** A signed-in account whose address is not the invited one is told so, and how to go on. */
export function assertInvitedAddress(invitation: Invitation, user: User): void {
  if (normaliseEmail(user.email) === normaliseEmail(invitation.email)) return;
  throw new HttpError(
    403,
    'invitation_other_address',
    `This invitation is for ${invitation.email}, and you are signed in as ${user.email}. Sign out and open the link again as ${invitation.email}, or ask the group owner to invite ${user.email}.`,
  );
}

/**
 * Who accepts: the invited address's account, already signed in or just signed in with
 * its password through the sign-in back-off (the route does that), or a new account for
 * the invited address.
 */
export type Acceptor = { user: User } | { newAccount: { displayName?: string | undefined; password?: string | undefined } };

/**
 * Accepts an invitation for the invited address only. Locked so that two clicks on one
 * link cannot both use it.
 */
export function acceptInvitation(token: string, acceptor: Acceptor): Promise<{ user: User; created: boolean; groupId: number }> {
  return Invitation.sequelize!.transaction(async (transaction) => {
    const found = await usableInvitation(token);
    const invitation = (await Invitation.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (invitation.acceptedAt) throw new HttpError(410, 'invitation_used', 'This invitation was used already.');
    if (invitation.revokedAt) throw new HttpError(410, 'invitation_revoked', 'This invitation was withdrawn. Ask the group owner for a new one.');
    let user: User;
    let created = false;
    if ('user' in acceptor) {
      user = acceptor.user;
      assertInvitedAddress(invitation, user);
    } else {
      const { displayName, password } = acceptor.newAccount;
      if (!displayName) throw new HttpError(400, 'invalid_input', 'displayName: Enter a display name.');
      if (!password) throw new HttpError(400, 'invalid_input', 'password: Choose a password.');
      assertPasswordAllowed(password, invitation.email);
      const passwordHash = await hashPassword(password);
      user = await User.create({ email: normaliseEmail(invitation.email), displayName, passwordHash }, { transaction }).catch(emailTakenOnRace);
      created = true;
    }
    if (user.disabled) throw new HttpError(403, 'account_disabled', 'This account is disabled. Ask the site admin to enable it.');
    const already = await Membership.findOne({ where: { groupId: invitation.groupId, userId: user.id }, transaction });
    if (!already) {
      await Membership.create({ groupId: invitation.groupId, userId: user.id, role: invitation.role }, { transaction }).catch((err) => {
        if (err instanceof UniqueConstraintError) throw new HttpError(409, 'already_member', 'You joined this group meanwhile. Open the group from your list.');
        throw err;
      });
    }
    await invitation.update({ acceptedAt: new Date() }, { transaction });
    return { user, created, groupId: invitation.groupId };
  });
}
