import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireRole } from '../middleware/requireRole';
import { signedInUser } from '../middleware/requireAuth';
import { idParamsSchema } from '../schemas/common.schema';
import { createUserSchema, listUsersQuerySchema, updateUserSchema } from '../schemas/users.schema';
import { getUserById, inviteUser, listUsers, updateUser } from '../services/users.service';

/** /api/users: the Team screen (admin only). */
export function createUsersRouter(): Router {
  const router = Router();
  router.use(requireRole('admin'));

  router.get('/', validate({ query: listUsersQuerySchema }), async function list(req, res) {
    res.status(200).json(await listUsers(req.query));
  });

  router.get('/:id', validate({ params: idParamsSchema }), async function getById(req, res) {
    res.status(200).json({ user: await getUserById(req.params.id) });
  });

  router.post('/', validate({ body: createUserSchema }), async function create(req, res) {
    const user = await inviteUser(signedInUser(req), req.body);
    res.status(201).json({ user });
  });

  router.patch('/:id', validate({ params: idParamsSchema, body: updateUserSchema }), async function update(req, res) {
    const user = await updateUser(signedInUser(req), req.params.id, req.body);
    res.status(200).json({ user });
  });

  return router;
}
