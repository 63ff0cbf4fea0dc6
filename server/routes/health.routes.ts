import { Router } from 'express';
import { checkHealth } from '../services/health.service';

/** /api/health: 200 when the database answers, 503 when it does not. No sign-in needed. */
export function createHealthRouter(): Router {
  const router = Router();
  router.get('/', async function getHealth(_req, res) {
    const health = await checkHealth();
    res.setHeader('Cache-Control', 'no-store');
    res.status(health.status === 'ok' ? 200 : 503).json(health);
  });
  return router;
}
