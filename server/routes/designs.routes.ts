import { Router } from 'express';
import { validate } from '../middleware/validate';
import { signedInUser } from '../middleware/requireAuth';
import { requireMember, requireRole } from '../middleware/requireRole';
import { idParamsSchema } from '../schemas/common.schema';
import { createDesignSchema, listDesignsQuerySchema, updateDesignSchema } from '../schemas/designs.schema';
import { createDesign, deleteDesign, exportDesign, getDesign, listDesigns, updateDesign } from '../services/designs.service';

/**
 * /api/designs: the Designs table and the Design desk's load/save.
 * Every team member (any role) reads (a design in review only those who may read its revision); designers (and admins) create, and change or delete their own drafts (admins any).
 */
export function createDesignsRouter(): Router {
  const router = Router();

  router.get('/', requireMember, validate({ query: listDesignsQuerySchema }), async function list(req, res) {
    res.status(200).json(await listDesigns(signedInUser(req), req.query));
  });

  router.post('/', requireRole('designer'), validate({ body: createDesignSchema }), async function create(req, res) {
    res.status(201).json(await createDesign(signedInUser(req), req.body));
  });

  router.get('/:id', requireMember, validate({ params: idParamsSchema }), async function getById(req, res) {
    res.status(200).json(await getDesign(signedInUser(req), req.params.id));
  });

  router.get('/:id/export', requireMember, validate({ params: idParamsSchema }), async function exportDocument(req, res) {
    const { fileName, document } = await exportDesign(signedInUser(req), req.params.id);
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
      res.status(200).json(await updateDesign(signedInUser(req), req.params.id, req.body));
    },
  );

  router.delete('/:id', requireRole('designer'), validate({ params: idParamsSchema }), async function remove(req, res) {
    await deleteDesign(signedInUser(req), req.params.id);
    res.status(204).end();
  });

  return router;
}
