import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireRole } from '../middleware/requireRole';
import { listAuditQuerySchema } from '../schemas/users.schema';
import { listAudit } from '../services/audit.service';

/** /api/audit: the audit log (admin only). */
export function createAuditRouter(): Router {
  const router = Router();
  router.get('/', requireRole('admin'), validate({ query: listAuditQuerySchema }), async function list(req, res) {
    res.status(200).json(await listAudit(req.query));
  });
  return router;
}
