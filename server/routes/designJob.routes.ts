import { Router } from 'express';
import { z } from 'zod';
import { requireRole } from '../middleware/requireRole';
import { uploadedFile, uploadMiddleware } from '../middleware/upload';
import { validate } from '../middleware/validate';
import { idParamsSchema } from '../schemas/common.schema';
import { assertMayUploadJob, JOB_CSV_MAX_BYTES, uploadDesignJob } from '../services/designJob.service';

const idOf = (params: unknown) => (params as { id: number }).id;

/** The multipart form of a job upload: the file and the design version the client holds. */
const jobUploadBodySchema = z.strictObject({
  version: z.coerce.number({ message: 'must be a number' }).int('must be a whole number').min(1, 'must be 1 or more'),
});

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
      await assertMayUploadJob(req.user!, idOf(req.params));
      next();
    },
    uploadMiddleware({ maxBytes: JOB_CSV_MAX_BYTES, what: 'job file' }),
    validate({ body: jobUploadBodySchema }),
    async function upload(req, res) {
      const { version } = req.body as z.infer<typeof jobUploadBodySchema>;
      res.status(200).json(await uploadDesignJob(req.user!, idOf(req.params), uploadedFile(req.file), version));
    },
  );

  return router;
}
