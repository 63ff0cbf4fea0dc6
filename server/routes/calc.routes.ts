import { Router } from 'express';
import type { DesignInput } from '@/engine';
import { validate } from '../middleware/validate';
import { requireAuth } from '../middleware/requireAuth';
import { calcSchema, compareSchema, sweepSchema } from '../schemas/calc.schema';
import { calculateJson } from '../services/calc.service';
import type { ResultSection } from '../workers/sections';

/**
 * /api/calc: the engine over HTTP for any signed-in user (the Design desk also runs it in the browser).
 *   POST /api/calc {design, sections?}       → the result (src/engine/README.md "Result"), or only the named sections
 *   POST /api/calc/compare {design}          → {rows: one per mechanism}
 *   POST /api/calc/sweep {design, path, values} → {path, points: one per value}
 * Invalid input → 400 with details naming `design.<field>`, `sections`, `path` or `values`.
 * The engine and the JSON encoding run in the engine worker pool; the handlers only send the bytes.
 */
export function createCalcRouter(): Router {
  const router = Router();
  router.use(requireAuth);

  router.post('/', validate({ body: calcSchema }), async function evaluate(req, res) {
    const body = req.body as { design: DesignInput; sections?: ResultSection[] };
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'result', design: body.design, sections: body.sections }));
  });

  router.post('/compare', validate({ body: compareSchema }), async function compareMechanisms(req, res) {
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'compare', design: (req.body as { design: DesignInput }).design }));
  });

  router.post('/sweep', validate({ body: sweepSchema }), async function sweep(req, res) {
    const body = req.body as { design: DesignInput; path: string; values: number[] };
    res
      .status(200)
      .type('application/json')
      .send(await calculateJson({ kind: 'sweep', design: body.design, path: body.path, values: body.values }));
  });

  return router;
}
