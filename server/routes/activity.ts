import { Router } from 'express';
import { QueryTypes } from 'sequelize';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole } from '../middleware/group-access.js';
import { idParam } from '../middleware/validate.js';
import { Group } from '../models/index.js';

/** GET /api/groups/:groupId/activity: who did what, newest first (members only). */
export function activityRoutes(): Router {
  const router = Router({ mergeParams: true });
  router.get('/', async (req, res) => {
    const groupId = idParam((req.params as Record<string, string>)['groupId'], 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    const rows = await Group.sequelize!.query<{ id: number; action: string; subject: string; worksheet_id: number | null; created_at: Date; who: string | null }>(
      `SELECT a.id, a.action, a.subject, a.worksheet_id, a.created_at, u.display_name AS who
       FROM activity a LEFT JOIN users u ON u.id = a.user_id WHERE a.group_id = $1 ORDER BY a.created_at DESC, a.id DESC LIMIT 200`,
      { bind: [groupId], type: QueryTypes.SELECT },
    );
    res.json({ activity: rows.map((r) => ({ id: r.id, who: r.who ?? 'a former member', action: r.action, subject: r.subject, worksheetId: r.worksheet_id, at: new Date(r.created_at).toISOString() })) });
  });
  return router;
}
