import { Router } from 'express';
import { z } from 'zod';
import { requireRole } from '../middleware/requireRole';
import { uploadedFile, uploadMiddleware } from '../middleware/upload';
import { validate } from '../middleware/validate';
import { idSchema, paginationSchema } from '../schemas/common.schema';
import {
  assertSheetTakesMeasurements,
  getMeasurement,
  getRecording,
  listMeasurements,
  recordMeasurement,
  RECORDING_MAX_BYTES,
  TYPED_FREQUENCY_RANGE_HZ,
  type RecordMeasurementInput,
} from '../services/measurements.service';

/** Everyone with a role may read a sheet's measurements; makers (and admins) record them. */
const SHEET_READERS = ['maker', 'designer', 'reviewer'] as const;

const sheetParamsSchema = z.object({ id: idSchema });
const measurementParamsSchema = z.object({ id: idSchema, measurementId: idSchema });
const listQuerySchema = paginationSchema.extend({ pageSize: paginationSchema.shape.pageSize.unwrap().default(100) });

/**
 * POST body: JSON `{spanId, frequencyHz}`, or the text fields of a multipart form (`spanId` plus the `file`), where
 * numbers arrive as text. An empty `frequencyHz` field counts as not given.
 */
const recordBodySchema = z.strictObject(
  {
    spanId: z.string({ message: 'is required' }).trim().min(1, 'is required').max(120, 'must be at most 120 characters'),
    frequencyHz: z.preprocess(
      (v) => (v === '' || v === null ? undefined : typeof v === 'string' ? Number(v.trim().replace(',', '.')) : v),
      z
        .number({ message: 'must be a number [Hz]' })
        .refine(Number.isFinite, 'must be a finite number [Hz]')
        .min(TYPED_FREQUENCY_RANGE_HZ.min, `must be at least ${TYPED_FREQUENCY_RANGE_HZ.min} Hz`)
        .max(TYPED_FREQUENCY_RANGE_HZ.max, `must be at most ${TYPED_FREQUENCY_RANGE_HZ.max} Hz`)
        .optional(),
    ),
  },
  { message: 'must be a JSON object or a form with spanId and frequencyHz or file' },
);

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
      await assertSheetTakesMeasurements((req.params as unknown as { id: number }).id);
      next();
    },
    uploadMiddleware({ maxBytes: RECORDING_MAX_BYTES, what: 'recording' }),
    validate({ body: recordBodySchema }),
    async function create(req, res) {
      const { id } = req.params as unknown as { id: number };
      res.status(201).json(await recordMeasurement(req.user!, id, req.body as RecordMeasurementInput, uploadedFile(req.file)));
    },
  );

  router.get(
    '/:id/measurements',
    requireRole(...SHEET_READERS),
    validate({ params: sheetParamsSchema, query: listQuerySchema }),
    async function list(req, res) {
      const { id } = req.params as unknown as { id: number };
      res.status(200).json(await listMeasurements(req.user!, id, req.query as unknown as { page: number; pageSize: number }));
    },
  );

  router.get(
    '/:id/measurements/:measurementId',
    requireRole(...SHEET_READERS),
    validate({ params: measurementParamsSchema }),
    async function getById(req, res) {
      const { id, measurementId } = req.params as unknown as { id: number; measurementId: number };
      res.status(200).json(await getMeasurement(id, measurementId));
    },
  );

  router.get(
    '/:id/measurements/:measurementId/recording',
    requireRole(...SHEET_READERS),
    validate({ params: measurementParamsSchema }),
    async function download(req, res) {
      const { id, measurementId } = req.params as unknown as { id: number; measurementId: number };
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
