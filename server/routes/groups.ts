import { Router } from 'express';
import { fn, col } from 'sequelize';
import { groupBody, type GroupSummaryDto, type GroupRole } from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { idParam, parseInput } from '../middleware/validate.js';
import { Group, Membership, Worksheet } from '../models/index.js';

async function summary(group: Group, role: GroupRole): Promise<GroupSummaryDto> {
  const [memberCount, worksheetCount] = await Promise.all([
    Membership.count({ where: { groupId: group.id } }),
    Worksheet.count({ where: { groupId: group.id } }),
  ]);
  return { id: group.id, name: group.name, role, memberCount, worksheetCount };
}

export function groupRoutes(): Router {
  const router = Router();

  router.get('/', async (req, res) => {
    const user = currentUser(req);
    const memberships = await Membership.findAll({ where: { userId: user.id }, order: [['groupId', 'ASC']] });
    const ids = memberships.map((m) => m.groupId);
    const [groups, members, sheets] = await Promise.all([
      Group.findAll({ where: { id: ids } }),
      Membership.findAll({ attributes: ['groupId', [fn('count', col('user_id')), 'n']], where: { groupId: ids }, group: ['groupId'], raw: true }),
      Worksheet.findAll({ attributes: ['groupId', [fn('count', col('id')), 'n']], where: { groupId: ids }, group: ['groupId'], raw: true }),
    ]);
    const count = (rows: unknown[], id: number) => Number((rows as { groupId: number; n: string }[]).find((r) => r.groupId === id)?.n ?? 0);
    const byId = new Map(groups.map((g) => [g.id, g]));
    res.json({
      groups: memberships
        .filter((m) => byId.has(m.groupId))
        .map((m) => ({
          id: m.groupId,
          name: byId.get(m.groupId)!.name,
          role: m.role,
          memberCount: count(members, m.groupId),
          worksheetCount: count(sheets, m.groupId),
        })),
    });
  });

  router.post('/', async (req, res) => {
    const user = currentUser(req);
    const body = parseInput(groupBody, req.body);
    const group = await Group.sequelize!.transaction(async (transaction) => {
      const created = await Group.create({ name: body.name }, { transaction });
      await Membership.create({ groupId: created.id, userId: user.id, role: 'owner' }, { transaction });
      return created;
    });
    res.status(201).json({ group: await summary(group, 'owner') });
  });

  router.get('/:groupId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    const role = await requireGroupRole(currentUser(req).id, groupId, 'read');
    const group = (await Group.findByPk(groupId))!;
    res.json({ group: await summary(group, role) });
  });

  router.patch('/:groupId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    const role = await requireGroupRole(currentUser(req).id, groupId, 'manageGroup');
    const body = parseInput(groupBody, req.body);
    const group = (await Group.findByPk(groupId))!;
    await group.update({ name: body.name });
    res.json({ group: await summary(group, role) });
  });

  router.delete('/:groupId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageGroup');
    await Group.destroy({ where: { id: groupId } });
    res.status(204).end();
  });

  return router;
}
