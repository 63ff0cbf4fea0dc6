import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireMember, requireRole } from '../middleware/requireRole';
import { idParamsSchema } from '../schemas/common.schema';
import {
  approveSchema,
  createCommentSchema,
  listRevisionsQuerySchema,
  returnSchema,
  type ListRevisionsQuery,
} from '../schemas/revisions.schema';
import { getRevision, getRevisionDiff, listRevisions } from '../services/revisions.service';
import { addComment, approveRevision, listComments, returnRevision } from '../services/reviews.service';

const idOf = (params: unknown) => (params as { id: number }).id;

/**
 * /api/revisions: frozen revisions, their diff and discussion, and the reviewer's decision.
 * There is deliberately no PUT, PATCH or DELETE: a revision never changes (404 for those methods).
 */
export function createRevisionsRouter(): Router {
  const router = Router();

  router.get('/', requireRole('reviewer'), validate({ query: listRevisionsQuerySchema }), async function list(req, res) {
    res.status(200).json(await listRevisions(req.user!, req.query as unknown as ListRevisionsQuery));
  });

  router.get('/:id', requireMember, validate({ params: idParamsSchema }), async function getById(req, res) {
    res.status(200).json(await getRevision(req.user!, idOf(req.params)));
  });

  router.get('/:id/diff', requireMember, validate({ params: idParamsSchema }), async function diff(req, res) {
    res.status(200).json(await getRevisionDiff(req.user!, idOf(req.params)));
  });

  router.get('/:id/comments', requireMember, validate({ params: idParamsSchema }), async function listThread(req, res) {
    res.status(200).json(await listComments(req.user!, idOf(req.params)));
  });

  router.post(
    '/:id/comments',
    requireMember,
    validate({ params: idParamsSchema, body: createCommentSchema }),
    async function comment(req, res) {
      res.status(201).json(await addComment(req.user!, idOf(req.params), req.body as { body: string; parentId?: number | null }));
    },
  );

  router.post(
    '/:id/approve',
    requireRole('reviewer'),
    validate({ params: idParamsSchema, body: approveSchema }),
    async function approve(req, res) {
      res.status(200).json(await approveRevision(req.user!, idOf(req.params), req.body as { comment: string; justification: string }));
    },
  );

  router.post(
    '/:id/return',
    requireRole('reviewer'),
    validate({ params: idParamsSchema, body: returnSchema }),
    async function returnToDesigner(req, res) {
      res.status(200).json(await returnRevision(req.user!, idOf(req.params), req.body as { reason: string }));
    },
  );

  return router;
}
