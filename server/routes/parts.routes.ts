import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireMember, requireRole } from '../middleware/requireRole';
import type { PartKind } from '../models';
import { idParamsSchema } from '../schemas/common.schema';
import {
  beltPartPatchSchema,
  beltPartSchema,
  listPartsQuerySchema,
  motorPartPatchSchema,
  motorPartSchema,
  pulleyPartPatchSchema,
  pulleyPartSchema,
  type ListPartsQuery,
  type PartInput,
  type PartPatch,
} from '../schemas/parts.schema';
import { createPart, getPart, listParts, PART_SHELVES, updatePart } from '../services/parts.service';

const SCHEMAS = {
  belt: { create: beltPartSchema, patch: beltPartPatchSchema },
  pulley: { create: pulleyPartSchema, patch: pulleyPartPatchSchema },
  motor: { create: motorPartSchema, patch: motorPartPatchSchema },
} as const;

/**
 * /api/parts: the shared parts shelf. Every team member (any role) reads; admins add, edit and retire.
 *   GET  /api/parts/{belts|pulleys|motors}?page&pageSize&q&includeRetired=1
 *   GET  /api/parts/{belts|pulleys|motors}/:id      (retired parts too)
 *   POST /api/parts/{belts|pulleys|motors}          (admin)
 *   PATCH /api/parts/{belts|pulleys|motors}/:id     (admin; `retired: true|false` retires/restores)
 * The singular segment (`/api/parts/belt/:id`) is accepted as an alias for PATCH and GET by id.
 */
export function createPartsRouter(): Router {
  const router = Router();

  for (const kind of Object.keys(PART_SHELVES) as PartKind[]) {
    const shelf = PART_SHELVES[kind];
    const schemas = SCHEMAS[kind];

    router.get(`/${shelf}`, requireMember, validate({ query: listPartsQuerySchema }), async function list(req, res) {
      res.status(200).json(await listParts(kind, req.query as unknown as ListPartsQuery));
    });

    router.post(`/${shelf}`, requireRole('admin'), validate({ body: schemas.create }), async function create(req, res) {
      res.status(201).json(await createPart(req.user!, kind, req.body as PartInput));
    });

    for (const segment of [shelf, kind]) {
      router.get(`/${segment}/:id`, requireMember, validate({ params: idParamsSchema }), async function getById(req, res) {
        res.status(200).json(await getPart(kind, (req.params as unknown as { id: number }).id));
      });

      router.patch(
        `/${segment}/:id`,
        requireRole('admin'),
        validate({ params: idParamsSchema, body: schemas.patch }),
        async function update(req, res) {
          res.status(200).json(await updatePart(req.user!, kind, (req.params as unknown as { id: number }).id, req.body as PartPatch));
        },
      );
    }
  }

  return router;
}
