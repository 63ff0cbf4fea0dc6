import { z } from 'zod';
import { TYPED_FREQUENCY_RANGE_HZ } from '../services/measurements.service';
import { idSchema, paginationSchema } from './common.schema';

export const sheetParamsSchema = z.object({ id: idSchema });
export const measurementParamsSchema = z.object({ id: idSchema, measurementId: idSchema });
export const measurementListQuerySchema = paginationSchema.extend({ pageSize: paginationSchema.shape.pageSize.unwrap().default(100) });

/**
 * POST body: JSON `{spanId, frequencyHz}`, or the text fields of a multipart form (`spanId` plus the `file`), where
 * numbers arrive as text. An empty `frequencyHz` field counts as not given.
 */
export const measurementRecordBodySchema = z.strictObject(
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
