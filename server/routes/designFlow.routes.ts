import { Router } from 'express';
import { validate } from '../middleware/validate';
import { signedInUser } from '../middleware/requireAuth';
import { requireMember, requireRole } from '../middleware/requireRole';
import { idParamsSchema } from '../schemas/common.schema';
import { emptyBodySchema, submitDesignSchema } from '../schemas/revisions.schema';
import { reopenDesign, submitDesign, withdrawDesign } from '../services/designFlow.service';
import { listDesignRevisions } from '../services/revisions.service';

/**
 * The review flow's routes under /api/designs (mounted beside the designs router, which has none of these paths):
 * submit a design for review, withdraw it, reopen an approved design for a new revision, and its revision history.
 */
export function createDesignFlowRouter(): Router {
  const router = Router();

  router.post(
    '/:id/submit',
    requireRole('designer'),
    validate({ params: idParamsSchema, body: submitDesignSchema }),
    async function submit(req, res) {
      res.status(201).json(await submitDesign(signedInUser(req), req.params.id, req.body));
    },
  );

  router.post(
    '/:id/withdraw',
    requireRole('designer'),
    validate({ params: idParamsSchema, body: emptyBodySchema }),
    async function withdraw(req, res) {
      res.status(200).json(await withdrawDesign(signedInUser(req), req.params.id));
    },
  );

  router.post(
    '/:id/reopen',
    requireRole('designer'),
    validate({ params: idParamsSchema, body: emptyBodySchema }),
    async function reopen(req, res) {
      res.status(200).json(await reopenDesign(signedInUser(req), req.params.id));
    },
  );

  router.get('/:id/revisions', requireMember, validate({ params: idParamsSchema }), async function listRevisions(req, res) {
    res.status(200).json(await listDesignRevisions(signedInUser(req), req.params.id));
  });

  return router;
}
