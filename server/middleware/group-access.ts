import type { FindOptions } from 'sequelize';
import { roleCan, type Ability, type GroupRole } from '../../shared/api.js';
import { Membership, Worksheet } from '../models/index.js';
import { forbidden, notFound } from './http-error.js';

/**
 * The caller's role in a group, checked against an ability. Non-members get 404,
 * not 403, so that group ids reveal nothing to outsiders.
 */
export async function requireGroupRole(userId: number, groupId: number, ability: Ability): Promise<GroupRole> {
  const membership = await Membership.findOne({ where: { groupId, userId } });
  if (!membership) throw notFound('This group');
  if (!roleCan(membership.role, ability)) throw forbidden();
  return membership.role;
}

/** Loads a worksheet (with `options`, e.g. an include) and checks the caller's role in its group. */
export async function requireWorksheetRole(userId: number, worksheetId: number, ability: Ability, options: FindOptions = {}) {
  const worksheet = await Worksheet.findByPk(worksheetId, options);
  if (!worksheet) throw notFound('This worksheet');
  const role = await requireGroupRole(userId, worksheet.groupId, ability).catch((err) => {
    if (err.status === 404) throw notFound('This worksheet');
    throw err;
  });
  return { worksheet, role };
}
