import type { UnitSystem } from '@/format';
import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireMember, requireRole } from '../middleware/requireRole';
import { idParamsSchema } from '../schemas/common.schema';
import { emptyBodySchema, submitDesignSchema } from '../schemas/revisions.schema';
import { listDesignRevisions, reopenDesign, submitDesign, withdrawDesign } from '../services/revisions.service';

const idOf = (params: unknown) => (params as { id: number }).id;

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
      res.status(201).json(await submitDesign(req.user!, idOf(req.params), req.body as { version?: number; sheetUnits?: UnitSystem }));
    },
  );

  router.post(
    '/:id/withdraw',
    requireRole('designer'),
    validate({ params: idParamsSchema, body: emptyBodySchema }),
    async function withdraw(req, res) {
      res.status(200).json(await withdrawDesign(req.user!, idOf(req.params)));
    },
  );

  router.post(
    '/:id/reopen',
    requireRole('designer'),
    validate({ params: idParamsSchema, body: emptyBodySchema }),
    async function reopen(req, res) {
      res.status(200).json(await reopenDesign(req.user!, idOf(req.params)));
    },
  );

  router.get('/:id/revisions', requireMember, validate({ params: idParamsSchema }), async function listRevisions(req, res) {
    res.status(200).json(await listDesignRevisions(req.user!, idOf(req.params)));
  });

  return router;
}
