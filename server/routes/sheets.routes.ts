import { Router } from 'express';
import { validate } from '../middleware/validate';
import { signedInUser } from '../middleware/requireAuth';
import { requireRole } from '../middleware/requireRole';
import { idParamsSchema } from '../schemas/common.schema';
import { listSheetsQuerySchema, sheetPdfQuerySchema } from '../schemas/sheets.schema';
import { getSheet, getSheetPdf, listSheets } from '../services/sheets.service';
import { SHEET_READERS } from '../services/access';

// Everyone with a role may read sheets (SHEET_READERS): makers build from them, the others check what was published.

/**
 * /api/sheets: approved design sheets and their stored PDF bytes. No route changes a sheet (no PUT, PATCH or
 * DELETE); the PDF is sent exactly as stored, with its SHA-256 as ETag and X-Content-SHA256.
 */
export function createSheetsRouter(): Router {
  const router = Router();

  router.get('/', requireRole(...SHEET_READERS), validate({ query: listSheetsQuerySchema }), async function list(req, res) {
    res.status(200).json(await listSheets(signedInUser(req), req.query));
  });

  router.get('/:id', requireRole(...SHEET_READERS), validate({ params: idParamsSchema }), async function getById(req, res) {
    res.status(200).json(await getSheet(signedInUser(req), req.params.id));
  });

  router.get(
    '/:id/pdf',
    requireRole(...SHEET_READERS),
    validate({ params: idParamsSchema, query: sheetPdfQuerySchema }),
    async function download(req, res) {
      const { bytes, sha256, fileName } = await getSheetPdf(signedInUser(req), req.params.id, req.query.paper);
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
