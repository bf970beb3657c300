import { Router } from 'express';
import { adminUserPatchBody } from '../../shared/api.js';
import { currentUser } from '../middleware/auth.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput } from '../middleware/validate.js';
import { User } from '../models/index.js';

/** Site administration; mounted behind requireAdmin. */
export function adminRoutes(): Router {
  const router = Router();

  router.get('/users', async (_req, res) => {
    const users = await User.findAll({ order: [['id', 'ASC']] });
    res.json({ users: users.map((u) => u.toDto()) });
  });

  router.patch('/users/:id', async (req, res) => {
    const id = idParam(req.params['id'], 'This account');
    const body = parseInput(adminUserPatchBody, req.body);
    if (id === currentUser(req).id && body.disabled) {
      throw new HttpError(409, 'self_disable', 'You cannot disable your own account. Ask another site admin.');
    }
    const user = await User.findByPk(id);
    if (!user) throw notFound('This account');
    await user.update({ disabled: body.disabled });
    // A disabled account's sessions end: deserializeUser refuses it on the next request.
    res.json({ user: user.toDto() });
  });

  return router;
}
