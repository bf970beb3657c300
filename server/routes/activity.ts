import { Router } from 'express';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { idParam } from '../middleware/validate.js';
import { listActivity } from '../services/activity.js';

/** GET /api/groups/:groupId/activity: who did what, newest first (members only). */
export function activityRoutes(): Router {
  const router = Router({ mergeParams: true });
  router.get('/', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    const rows = await listActivity(groupId);
    res.json({ activity: rows.map((r) => ({ id: r.id, who: r.who ?? 'a former member', action: r.action, subject: r.subject, worksheetId: r.worksheet_id, at: new Date(r.created_at).toISOString() })) });
  });
  return router;
}
