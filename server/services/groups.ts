/** Queries of groups and their counts. */
import { fn, col } from 'sequelize';
import type { GroupRole, GroupSummaryDto } from '../../shared/api.js';
import { Group, Membership, Worksheet } from '../models/index.js';

export async function groupSummary(group: Group, role: GroupRole): Promise<GroupSummaryDto> {
  const [memberCount, worksheetCount] = await Promise.all([Membership.count({ where: { groupId: group.id } }), Worksheet.count({ where: { groupId: group.id } })]);
  return { id: group.id, name: group.name, role, memberCount, worksheetCount };
}

/** The groups a person belongs to, with their role and counts, in group order. */
export async function groupsOf(userId: number): Promise<GroupSummaryDto[]> {
  const memberships = await Membership.findAll({ where: { userId }, order: [['groupId', 'ASC']] });
  const ids = memberships.map((m) => m.groupId);
  const [groups, members, sheets] = await Promise.all([
    Group.findAll({ where: { id: ids } }),
    Membership.findAll({ attributes: ['groupId', [fn('count', col('user_id')), 'n']], where: { groupId: ids }, group: ['groupId'], raw: true }),
    Worksheet.findAll({ attributes: ['groupId', [fn('count', col('id')), 'n']], where: { groupId: ids }, group: ['groupId'], raw: true }),
  ]);
  const count = (rows: unknown[], id: number) => Number((rows as { groupId: number; n: string }[]).find((r) => r.groupId === id)?.n ?? 0);
  const byId = new Map(groups.map((g) => [g.id, g]));
  return memberships
    .filter((m) => byId.has(m.groupId))
    .map((m) => ({ id: m.groupId, name: byId.get(m.groupId)!.name, role: m.role, memberCount: count(members, m.groupId), worksheetCount: count(sheets, m.groupId) }));
}

/** A new group whose creator is its owner. */
export function createGroup(name: string, ownerId: number): Promise<Group> {
  return Group.sequelize!.transaction(async (transaction) => {
    const created = await Group.create({ name }, { transaction });
    await Membership.create({ groupId: created.id, userId: ownerId, role: 'owner' }, { transaction });
    return created;
  });
}

export const findGroup = async (id: number) => (await Group.findByPk(id))!;

export async function renameGroup(id: number, name: string): Promise<Group> {
  const group = await findGroup(id);
  await group.update({ name });
  return group;
}

export async function deleteGroup(id: number): Promise<void> {
  await Group.destroy({ where: { id } });
}
