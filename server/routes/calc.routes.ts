import { Router, type Request } from 'express';
import { JSON_BODY_LIMIT, JSON_TYPES } from '../middleware/contentType';
import { rawJsonBodyMiddleware } from '../middleware/rawJsonBody';
import { requireAuth } from '../middleware/requireAuth';
import { calculateJson } from '../services/calc.service';
import type { CalcTask } from '../workers/tasks';

/**
 * /api/calc: the engine over HTTP for any signed-in user (the Design desk also runs it in the browser).
 *   POST /api/calc {design, sections?}       → the result (src/engine/README.md "Result"), or only the named sections
 *   POST /api/calc/compare {design}          → {rows: one per mechanism}
 *   POST /api/calc/sweep {design, path, values} → {path, points: one per value}
 * Invalid input → 400 with details naming `design.<field>`, `sections`, `path` or `values`.
 * After sign-in, everything runs in the engine worker pool: parsing and validating the body (schemas/calc.schema.ts,
 * the same messages as the validate middleware), the engine, and the JSON encoding; the handlers move bytes.
 */
export function createCalcRouter(): Router {
  const router = Router();
  router.use(requireAuth);
  const rawBody = rawJsonBodyMiddleware(JSON_BODY_LIMIT, JSON_TYPES);
  const body = (req: Request): CalcTask['body'] => (Buffer.isBuffer(req.body) ? req.body : null);

  router.post('/', ...rawBody, async function evaluate(req, res) {
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'result', body: body(req) }));
  });

  router.post('/compare', ...rawBody, async function compareMechanisms(req, res) {
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'compare', body: body(req) }));
  });

  router.post('/sweep', ...rawBody, async function sweep(req, res) {
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'sweep', body: body(req) }));
  });

  return router;
}
