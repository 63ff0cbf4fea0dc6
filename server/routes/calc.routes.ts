import { Router } from 'express';
import type { DesignInput } from '@/engine';
import { requireMember } from '../middleware/requireRole';
import { validate } from '../middleware/validate';
import { calcSchema, sweepSchema } from '../schemas/calc.schema';
import { calculate, compare, sweepInput } from '../services/calc.service';

/**
 * /api/calc: the engine over HTTP for every team member, any role (the Design desk also runs it in the browser).
 *   POST /api/calc {design}                  → the result (src/engine/README.md "Result")
 *   POST /api/calc/compare {design}          → {rows: one per mechanism}
 *   POST /api/calc/sweep {design, path, values} → {path, points: one per value}
 * Invalid input → 400 with details naming `design.<field>`, `path` or `values`.
 */
export function createCalcRouter(): Router {
  const router = Router();
  router.use(requireMember);

  router.post('/', validate({ body: calcSchema }), async function evaluate(req, res) {
    res.status(200).json(calculate((req.body as { design: DesignInput }).design));
  });

  router.post('/compare', validate({ body: calcSchema }), async function compareMechanisms(req, res) {
    res.status(200).json(compare((req.body as { design: DesignInput }).design));
  });

  router.post('/sweep', validate({ body: sweepSchema }), async function sweep(req, res) {
    const body = req.body as { design: DesignInput; path: string; values: number[] };
    res.status(200).json(await sweepInput(body.design, body.path, body.values));
  });

  return router;
}
