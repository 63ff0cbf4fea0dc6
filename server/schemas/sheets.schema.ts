import { z } from 'zod';
import type { SheetPaper } from '../models';
import { idSchema, paginationSchema } from './common.schema';

/** GET /api/sheets?page&pageSize&designId&current=true */
export const listSheetsQuerySchema = paginationSchema.extend({
  designId: idSchema.optional(),
  current: z
    .enum(['true', 'false'], { message: 'must be true or false' })
    .transform((v) => v === 'true')
    .optional(),
});

/** GET /api/sheets/:id/pdf?paper=a4|letter (default a4). */
export const sheetPdfQuerySchema = z.object({
  paper: z
    .enum(['a4', 'letter', 'A4', 'LETTER'], { message: 'must be a4 or letter' })
    .default('a4')
    .transform((p): SheetPaper => (p.toLowerCase() === 'a4' ? 'A4' : 'LETTER')),
});
