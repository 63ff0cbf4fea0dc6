import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireRole } from '../middleware/requireRole';
import { idParamsSchema } from '../schemas/common.schema';
import { listSheetsQuerySchema, sheetPdfQuerySchema, type ListSheetsQuery } from '../schemas/sheets.schema';
import type { SheetPaper } from '../models';
import { getSheet, getSheetPdf, listSheets } from '../services/sheets.service';

const idOf = (params: unknown) => (params as { id: number }).id;

/** Everyone with a role may read sheets: makers build from them, the others check what was published. */
const SHEET_READERS = ['maker', 'designer', 'reviewer'] as const;

/**
 * /api/sheets: approved design sheets and their stored PDF bytes. No route changes a sheet (no PUT, PATCH or
 * DELETE); the PDF is sent exactly as stored, with its SHA-256 as ETag and X-Content-SHA256.
 */
export function createSheetsRouter(): Router {
  const router = Router();

  router.get('/', requireRole(...SHEET_READERS), validate({ query: listSheetsQuerySchema }), async function list(req, res) {
    res.status(200).json(await listSheets(req.user!, req.query as unknown as ListSheetsQuery));
  });

  router.get('/:id', requireRole(...SHEET_READERS), validate({ params: idParamsSchema }), async function getById(req, res) {
    res.status(200).json(await getSheet(req.user!, idOf(req.params)));
  });

  router.get(
    '/:id/pdf',
    requireRole(...SHEET_READERS),
    validate({ params: idParamsSchema, query: sheetPdfQuerySchema }),
    async function download(req, res) {
      const { bytes, sha256, fileName } = await getSheetPdf(
        req.user!,
        idOf(req.params),
        (req.query as unknown as { paper: SheetPaper }).paper,
      );
      res.status(200);
      res.setHeader('Content-Type', 'application/pdf');
      // The name is a slug (a-z, 0-9, '-') so it needs no escaping.
      res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`);
      res.setHeader('ETag', `"${sha256}"`);
      res.setHeader('X-Content-SHA256', sha256);
      res.setHeader('Content-Length', String(bytes.length));
      // The bytes never change: a private cache may keep them (the /api default is no-store).
      res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
      res.send(bytes); // send() answers 304 when If-None-Match matches the ETag
    },
  );

  return router;
}
