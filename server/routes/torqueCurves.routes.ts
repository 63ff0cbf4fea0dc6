import { Router } from 'express';
import { requireMember, requireRole } from '../middleware/requireRole';
import { uploadedFile, uploadMiddleware } from '../middleware/upload';
import { validate } from '../middleware/validate';
import { signedInUser } from '../middleware/requireAuth';
import { idParamsSchema } from '../schemas/common.schema';
import { torqueUploadBodySchema } from '../schemas/parts.schema';
import { assertMotorExists, getTorqueCurve, TORQUE_CSV_MAX_BYTES, uploadTorqueCurve } from '../services/torqueCurves.service';

/**
 * Motor torque–speed tables, mounted at /api/parts (beside the parts router):
 *   POST /api/parts/motors/:id/torque-curve   multipart `file` = CSV ≤ 64 kB, `supplyV`, `currentRmsA` (what it was measured at)
 *                                             (admin) → 200 { motor, file, sourceUnits }
 *   GET  /api/parts/motors/:id/torque-curve   every team member → { motor, file }
 * Clearing a table is PATCH /api/parts/motors/:id { torqueCurve: null } on the parts router.
 */
export function createTorqueCurvesRouter(): Router {
  const router = Router();

  router.post(
    '/motors/:id/torque-curve',
    requireRole('admin'),
    validate({ params: idParamsSchema }),
    async function checkMotor(req, _res, next) {
      await assertMotorExists(req.params.id);
      next();
    },
    uploadMiddleware({ maxBytes: TORQUE_CSV_MAX_BYTES, what: 'torque table' }),
    validate({ body: torqueUploadBodySchema }),
    async function upload(req, res) {
      res.status(200).json(await uploadTorqueCurve(signedInUser(req), req.params.id, uploadedFile(req.file), req.body));
    },
  );

  router.get('/motors/:id/torque-curve', requireMember, validate({ params: idParamsSchema }), async function getById(req, res) {
    res.status(200).json(await getTorqueCurve(signedInUser(req), req.params.id));
  });

  return router;
}
