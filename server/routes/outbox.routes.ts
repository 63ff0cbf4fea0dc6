import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireRole } from '../middleware/requireRole';
import { listOutboxQuerySchema } from '../schemas/users.schema';
import { listOutbox } from '../services/outbox.service';

/** /api/outbox: mail caught by the local catcher (admin; mounted only outside production). */
export function createOutboxRouter(): Router {
  const router = Router();
  router.get('/', requireRole('admin'), validate({ query: listOutboxQuerySchema }), async function list(req, res) {
    res.status(200).json(await listOutbox(req.query));
  });
  return router;
}
