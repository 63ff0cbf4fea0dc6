import { Router } from 'express';
import { requireRole } from '../middleware/requireRole';
import { uploadedFile, uploadMiddleware } from '../middleware/upload';
import { validate } from '../middleware/validate';
import { signedInUser } from '../middleware/requireAuth';
import {
  measurementListQuerySchema,
  measurementParamsSchema,
  measurementRecordBodySchema,
  sheetParamsSchema,
} from '../schemas/measurements.schema';
import {
  assertSheetTakesMeasurements,
  getMeasurement,
  getRecording,
  listMeasurements,
  recordMeasurement,
  RECORDING_MAX_BYTES,
} from '../services/measurements.service';
import { SHEET_READERS } from '../services/access';

// Everyone with a role may read a sheet's measurements (SHEET_READERS); makers (and admins) record them.

/**
 * Belt tension measurements of a sheet, mounted at /api/sheets (beside the sheets router):
 *   POST /api/sheets/:id/measurements      JSON {spanId, frequencyHz} or multipart spanId + file (WAV ≤ 2 MB, ≤ 10 s)
 *                                          (maker, admin) → 201 measurement with spectrum
 *   GET  /api/sheets/:id/measurements      → { items, total, page, pageSize, spans, pairs, tolerances, canRecord }
 *   GET  /api/sheets/:id/measurements/:measurementId            → one measurement with its spectrum
 *   GET  /api/sheets/:id/measurements/:measurementId/recording  → the stored WAV
 */
export function createMeasurementsRouter(): Router {
  const router = Router();

  router.post(
    '/:id/measurements',
    requireRole('maker'),
    validate({ params: sheetParamsSchema }),
    async function checkSheet(req, _res, next) {
      await assertSheetTakesMeasurements(req.params.id);
      next();
    },
    uploadMiddleware({ maxBytes: RECORDING_MAX_BYTES, what: 'recording' }),
    validate({ body: measurementRecordBodySchema }),
    async function create(req, res) {
      const { id } = req.params;
      res.status(201).json(await recordMeasurement(signedInUser(req), id, req.body, uploadedFile(req.file)));
    },
  );

  router.get(
    '/:id/measurements',
    requireRole(...SHEET_READERS),
    validate({ params: sheetParamsSchema, query: measurementListQuerySchema }),
    async function list(req, res) {
      const { id } = req.params;
      res.status(200).json(await listMeasurements(signedInUser(req), id, req.query));
    },
  );

  router.get(
    '/:id/measurements/:measurementId',
    requireRole(...SHEET_READERS),
    validate({ params: measurementParamsSchema }),
    async function getById(req, res) {
      const { id, measurementId } = req.params;
      res.status(200).json(await getMeasurement(id, measurementId));
    },
  );

  router.get(
    '/:id/measurements/:measurementId/recording',
    requireRole(...SHEET_READERS),
    validate({ params: measurementParamsSchema }),
    async function download(req, res) {
      const { id, measurementId } = req.params;
      const { bytes, fileName, sha256 } = await getRecording(id, measurementId);
      res.status(200);
      res.setHeader('Content-Type', 'audio/wav');
      res.attachment(fileName);
      res.setHeader('X-Content-Type-Options', 'nosniff');
      res.setHeader('ETag', `"${sha256}"`);
      res.setHeader('Content-Length', String(bytes.length));
      res.end(bytes);
    },
  );

  return router;
}
