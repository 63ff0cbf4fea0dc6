import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireRole } from '../middleware/requireRole';
import { idParamsSchema } from '../schemas/common.schema';
import { createUserSchema, listUsersQuerySchema, updateUserSchema } from '../schemas/users.schema';
import { getUserById, inviteUser, listUsers, updateUser } from '../services/users.service';
import type { Role } from '../models';

/** /api/users: the Team screen (admin only). */
export function createUsersRouter(): Router {
  const router = Router();
  router.use(requireRole('admin'));

  router.get('/', validate({ query: listUsersQuerySchema }), async function list(req, res) {
    res.status(200).json(await listUsers(req.query as unknown as { page: number; pageSize: number; q?: string }));
  });

  router.get('/:id', validate({ params: idParamsSchema }), async function getById(req, res) {
    res.status(200).json({ user: await getUserById((req.params as unknown as { id: number }).id) });
  });

  router.post('/', validate({ body: createUserSchema }), async function create(req, res) {
    const user = await inviteUser(req.user!, req.body as { email: string; name: string; roles: Role[] });
    res.status(201).json({ user });
  });

  router.patch('/:id', validate({ params: idParamsSchema, body: updateUserSchema }), async function update(req, res) {
    const user = await updateUser(
      req.user!,
      (req.params as unknown as { id: number }).id,
      req.body as { name?: string; roles?: Role[]; disabled?: boolean },
    );
    res.status(200).json({ user });
  });

  return router;
}
