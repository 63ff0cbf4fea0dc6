import { Router } from 'express';
import { requireMember, requireRole } from '../middleware/requireRole';
import { uploadedFile, uploadMiddleware } from '../middleware/upload';
import { validate } from '../middleware/validate';
import { signedInUser } from '../middleware/requireAuth';
import { idParamsSchema } from '../schemas/common.schema';
import { attachmentListQuerySchema, attachmentUploadBodySchema } from '../schemas/attachments.schema';
import {
  assertMayAttach,
  ATTACHMENT_MAX_BYTES,
  deleteAttachment,
  getAttachmentDownload,
  listDesignAttachments,
  uploadDesignAttachment,
} from '../services/attachments.service';

/**
 * Design attachments, mounted at /api/designs (beside the designs router; Express falls through to it):
 *   POST /api/designs/:id/attachments   multipart `file` ≤ 10 MB: PDF, PNG, JPEG or CSV (owner designer or admin) → 201
 *   GET  /api/designs/:id/attachments   every team member → { items, total, page, pageSize, canUpload }
 */
export function createDesignAttachmentsRouter(): Router {
  const router = Router();

  router.post(
    '/:id/attachments',
    requireRole('designer'),
    validate({ params: idParamsSchema }),
    async function checkDesign(req, _res, next) {
      await assertMayAttach(signedInUser(req), req.params.id);
      next();
    },
    uploadMiddleware({ maxBytes: ATTACHMENT_MAX_BYTES, what: 'attachment' }),
    validate({ body: attachmentUploadBodySchema }),
    async function create(req, res) {
      res.status(201).json(await uploadDesignAttachment(signedInUser(req), req.params.id, uploadedFile(req.file)));
    },
  );

  router.get(
    '/:id/attachments',
    requireMember,
    validate({ params: idParamsSchema, query: attachmentListQuerySchema }),
    async function list(req, res) {
      res.status(200).json(await listDesignAttachments(signedInUser(req), req.params.id, req.query));
    },
  );

  return router;
}

/**
 * /api/attachments/:id — download (every team member) and delete (uploader, design owner or admin).
 * Downloads carry the sniffed Content-Type, `attachment` disposition with the sanitised name, nosniff and a
 * sandboxing CSP, so a file can never run as a page of the app.
 */
export function createAttachmentsRouter(): Router {
  const router = Router();

  router.get('/:id', requireMember, validate({ params: idParamsSchema }), async function getById(req, res) {
    const { bytes, mime, fileName, sha256 } = await getAttachmentDownload(req.params.id);
    res.status(200);
    res.setHeader('Content-Type', mime === 'text/csv' ? 'text/csv; charset=utf-8' : mime);
    res.attachment(fileName);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Content-Security-Policy', "default-src 'none'; sandbox");
    res.setHeader('ETag', `"${sha256}"`);
    res.setHeader('X-Content-SHA256', sha256);
    res.setHeader('Content-Length', String(bytes.length));
    res.setHeader('Cache-Control', 'private, no-cache');
    res.end(bytes);
  });

  router.delete('/:id', requireRole('designer'), validate({ params: idParamsSchema }), async function remove(req, res) {
    await deleteAttachment(signedInUser(req), req.params.id);
    res.status(204).end();
  });

  return router;
}
