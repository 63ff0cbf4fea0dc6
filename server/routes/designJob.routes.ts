import { Router } from 'express';
import { requireRole } from '../middleware/requireRole';
import { uploadedFile, uploadMiddleware } from '../middleware/upload';
import { validate } from '../middleware/validate';
import { idParamsSchema } from '../schemas/common.schema';
import { jobUploadBodySchema } from '../schemas/designJob.schema';
import { signedInUser } from '../middleware/requireAuth';
import { assertMayUploadJob, JOB_CSV_MAX_BYTES, uploadDesignJob } from '../services/designJob.service';

/**
 * A design's job points from a CSV file, mounted at /api/designs (beside the designs router):
 *   POST /api/designs/:id/job   multipart `file` = CSV ≤ 64 kB, `version` (owner designer or admin)
 *                               → 200 { design, job: { pointCount, sourceUnits }, file }
 * Typed points and clearing the job go through PATCH /api/designs/:id with `inputs.job`.
 */
export function createDesignJobRouter(): Router {
  const router = Router();

  router.post(
    '/:id/job',
    requireRole('designer'),
    validate({ params: idParamsSchema }),
    async function checkDesign(req, _res, next) {
      await assertMayUploadJob(signedInUser(req), req.params.id);
      next();
    },
    uploadMiddleware({ maxBytes: JOB_CSV_MAX_BYTES, what: 'job file' }),
    validate({ body: jobUploadBodySchema }),
    async function upload(req, res) {
      const { version } = req.body;
      res.status(200).json(await uploadDesignJob(signedInUser(req), req.params.id, uploadedFile(req.file), version));
    },
  );

  return router;
}
