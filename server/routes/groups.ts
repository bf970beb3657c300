import { Router } from 'express';
import { groupBody } from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { idParam, parseInput } from '../middleware/validate.js';
import { createGroup, deleteGroup, findGroup, groupSummary, groupsOf, renameGroup } from '../services/groups.js';

export function groupRoutes(): Router {
  const router = Router();

  router.get('/', async (req, res) => {
    res.json({ groups: await groupsOf(currentUser(req).id) });
  });

  router.post('/', async (req, res) => {
    const body = parseInput(groupBody, req.body);
    const group = await createGroup(body.name, currentUser(req).id);
    res.status(201).json({ group: await groupSummary(group, 'owner') });
  });

  router.get('/:groupId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    const role = await requireGroupRole(currentUser(req).id, groupId, 'read');
    res.json({ group: await groupSummary(await findGroup(groupId), role) });
  });

  router.patch('/:groupId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    const role = await requireGroupRole(currentUser(req).id, groupId, 'manageGroup');
    const body = parseInput(groupBody, req.body);
    res.json({ group: await groupSummary(await renameGroup(groupId, body.name), role) });
  });

  router.delete('/:groupId', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'manageGroup');
    await deleteGroup(groupId);
    res.status(204).end();
  });

  return router;
}
