import { Router, type Request } from 'express';
import type { z } from 'zod';
import { JSON_BODY_LIMIT, JSON_TYPES } from '../middleware/contentType';
import { rawJsonBodyMiddleware } from '../middleware/rawJsonBody';
import { requireMember } from '../middleware/requireRole';
import { calcSchema, compareSchema, sweepSchema } from '../schemas/calc.schema';
import { calculateJson } from '../services/calc.service';
import type { CalcTask } from '../workers/tasks';

/**
 * /api/calc: the engine over HTTP for every team member, any role (the Design desk also runs it in the browser).
 *   POST /api/calc {design, sections?}       → the result (src/engine/README.md "Result"), or only the named sections
 *   POST /api/calc/compare {design}          → {rows: one per mechanism}
 *   POST /api/calc/sweep {design, path, values} → {path, points: one per value}
 * Invalid input → 400 with details naming `design.<field>`, `sections`, `path` or `values`.
 * After the role check, everything runs in the engine worker pool: parsing and validating the body (schemas/calc.schema.ts,
 * the same checks and messages as the validate middleware), the engine, and the JSON encoding; the handlers move bytes.
 */
export function createCalcRouter(): Router {
  const router = Router();
  router.use(requireMember);
  const rawBody = (schema: z.ZodType) => rawJsonBodyMiddleware(JSON_BODY_LIMIT, JSON_TYPES, { body: schema });
  const body = (req: Request): CalcTask['body'] => (Buffer.isBuffer(req.body) ? req.body : null);

  router.post('/', ...rawBody(calcSchema), async function evaluate(req, res) {
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'result', body: body(req) }));
  });

  router.post('/compare', ...rawBody(compareSchema), async function compareMechanisms(req, res) {
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'compare', body: body(req) }));
  });

  router.post('/sweep', ...rawBody(sweepSchema), async function sweep(req, res) {
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'sweep', body: body(req) }));
  });

  return router;
}
