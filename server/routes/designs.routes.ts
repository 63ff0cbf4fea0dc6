import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireMember, requireRole } from '../middleware/requireRole';
import { idParamsSchema } from '../schemas/common.schema';
import {
  createDesignSchema,
  listDesignsQuerySchema,
  updateDesignSchema,
  type CreateDesignInput,
  type ListDesignsQuery,
  type UpdateDesignInput,
} from '../schemas/designs.schema';
import { createDesign, deleteDesign, exportDesign, getDesign, listDesigns, updateDesign } from '../services/designs.service';

const idOf = (params: unknown) => (params as { id: number }).id;

/**
 * /api/designs: the Designs table and the Design desk's load/save.
 * Every team member (any role) reads (a design in review only those who may read its revision); designers (and admins) create, and change or delete their own drafts (admins any).
 */
export function createDesignsRouter(): Router {
  const router = Router();

  router.get('/', requireMember, validate({ query: listDesignsQuerySchema }), async function list(req, res) {
    res.status(200).json(await listDesigns(req.user!, req.query as unknown as ListDesignsQuery));
  });

  router.post('/', requireRole('designer'), validate({ body: createDesignSchema }), async function create(req, res) {
    res.status(201).json(await createDesign(req.user!, req.body as CreateDesignInput));
  });

  router.get('/:id', requireMember, validate({ params: idParamsSchema }), async function getById(req, res) {
    res.status(200).json(await getDesign(req.user!, idOf(req.params)));
  });

  router.get('/:id/export', requireMember, validate({ params: idParamsSchema }), async function exportDocument(req, res) {
    const { fileName, document } = await exportDesign(req.user!, idOf(req.params));
    res.attachment(fileName);
    res
      .type('application/json')
      .status(200)
      .send(`${JSON.stringify(document, null, 2)}\n`);
  });

  router.patch(
    '/:id',
    requireRole('designer'),
    validate({ params: idParamsSchema, body: updateDesignSchema }),
    async function update(req, res) {
      res.status(200).json(await updateDesign(req.user!, idOf(req.params), req.body as UpdateDesignInput));
    },
  );

  router.delete('/:id', requireRole('designer'), validate({ params: idParamsSchema }), async function remove(req, res) {
    await deleteDesign(req.user!, idOf(req.params));
    res.status(204).end();
  });

  return router;
}
