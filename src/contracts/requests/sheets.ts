// What the client asks of /api/sheets: the list query and the paper of a PDF.
import { z } from 'zod';
import type { SheetPaper } from '../enums';
import { idSchema, paginationSchema } from './common';

/** GET /api/sheets?page&pageSize&designId&current=true */
export const listSheetsQuerySchema = paginationSchema.extend({
  designId: idSchema.optional(),
  current: z
    .enum(['true', 'false'], { message: 'must be true or false' })
    .transform((v) => v === 'true')
    .optional(),
});

/** The Sheets list query as the client sends it (`current: 'true'` for sheets not superseded by a later approval). */
export type SheetListQuery = z.input<typeof listSheetsQuerySchema>;

/** GET /api/sheets/:id/pdf?paper=a4|letter (default a4). */
export const sheetPdfQuerySchema = z.object({
  paper: z
    .enum(['a4', 'letter', 'A4', 'LETTER'], { message: 'must be a4 or letter' })
    .default('a4')
    .transform((p): SheetPaper => (p.toLowerCase() === 'a4' ? 'A4' : 'LETTER')),
});
