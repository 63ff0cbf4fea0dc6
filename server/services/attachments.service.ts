import type { AttachmentPage, PublicAttachment } from '@/contracts';
import { Op } from 'sequelize';
import { getSequelize } from '../db';
import { AppError, notFound } from '../errors';
import type { UploadedFile } from '../uploads/uploadedFile';
import { Attachment, Design, User, type AttachmentMime } from '../models';
import { getContentStore } from '../storage';
import { assertTypeMatches, type SniffedMime } from '../uploads';
import { removeUnreferencedBytes, sanitiseFileName, storeWithRows, withUploadErrors } from './fileStore.service';
import { assertMayAttach as assertMayAttachTo, assertMayDeleteAttachment, mayChangeDesign, mayDeleteAttachment } from './access';
import { recordAudit } from './audit.service';
import type { PublicUser } from './users.service';

/** Largest design attachment [bytes] (issue 6: 10 MB). */
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;

/** What a design may take: datasheets, photos and tables, recognised from their bytes. */
export const ATTACHMENT_TYPES: readonly SniffedMime[] = ['application/pdf', 'image/png', 'image/jpeg', 'text/csv'];

type AttachmentRow = Attachment & { uploadedBy?: User | null; design?: Design | null };

/** Converts a row to the public shape for `actor`. */
export function toPublicAttachment(row: AttachmentRow, actor: PublicUser, design: Pick<Design, 'ownerId'> | null): PublicAttachment {
  return {
    id: row.id,
    designId: row.designId ?? null,
    partId: row.partId ?? null,
    fileName: row.fileName,
    mime: row.mime,
    size: row.size,
    sha256: row.sha256,
    uploadedBy: row.uploadedBy ? { id: row.uploadedBy.id, name: row.uploadedBy.name } : null,
    createdAt: new Date(row.createdAt).toISOString(),
    url: `/api/attachments/${row.id}`,
    canDelete: mayDeleteAttachment(actor, row, design),
  };
}

const UPLOADER_INCLUDE = { model: User, as: 'uploadedBy', attributes: ['id', 'name'] };

async function findDesignOr404(id: number): Promise<Design> {
  const design = await Design.findByPk(id, { attributes: ['id', 'ownerId', 'name'] });
  if (!design) throw notFound('Design');
  return design;
}

/**
 * Refuses early (before an upload is read) when the design does not exist (404) or `actor` may not attach files
 * to it (403: only its owner as designer, or an admin).
 */
export async function assertMayAttach(actor: PublicUser, designId: number): Promise<Design> {
  const design = await findDesignOr404(designId);
  assertMayAttachTo(actor, design);
  return design;
}

/**
 * Attaches a file to a design (its owner as designer, or an admin). The type is taken from the bytes (PDF, PNG,
 * JPEG or CSV) and must agree with the name's extension and the declared type (415 otherwise); the bytes go to the
 * content store under their SHA-256, the metadata to `attachments`, in one transaction.
 */
export async function uploadDesignAttachment(actor: PublicUser, designId: number, file: UploadedFile | null): Promise<PublicAttachment> {
  const design = await assertMayAttach(actor, designId);
  if (!file)
    throw new AppError('validation_failed', 'Choose a file to attach.', 400, {
      details: [{ path: 'file', message: 'is required (multipart field "file")' }],
    });
  const sniffed = await withUploadErrors(() => assertTypeMatches(file.declaredMime, file.originalName, file.bytes, ATTACHMENT_TYPES));
  const mime: AttachmentMime = sniffed.mime === 'text/plain' ? 'text/csv' : (sniffed.mime as AttachmentMime);
  const fileName = sanitiseFileName(file.originalName, mime);

  const row = await storeWithRows(file.bytes, async (transaction, sha256) => {
    const created = await Attachment.create(
      {
        designId,
        partId: null,
        uploadedById: actor.id,
        fileName,
        mime,
        size: file.bytes.length,
        sha256,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'attachment.create',
        entity: 'attachment',
        entityId: created.id,
        toState: `design ${designId}`,
        reason: `${fileName} (${mime}, ${file.bytes.length} bytes, SHA-256 ${sha256})`,
      },
      transaction,
    );
    return created;
  });
  const full = (await Attachment.findByPk(row.id, { include: [UPLOADER_INCLUDE] })) as AttachmentRow;
  return toPublicAttachment(full, actor, design);
}

/** A design's attachments, newest first; every team member may read them (as they may read the design). */
export async function listDesignAttachments(
  actor: PublicUser,
  designId: number,
  query: { page: number; pageSize: number },
): Promise<AttachmentPage> {
  const design = await findDesignOr404(designId);
  const { rows, count } = (await Attachment.findAndCountAll({
    where: { designId },
    include: [UPLOADER_INCLUDE],
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  })) as { rows: AttachmentRow[]; count: number };
  return {
    items: rows.map((row) => toPublicAttachment(row, actor, design)),
    total: count,
    page: query.page,
    pageSize: query.pageSize,
    canUpload: mayChangeDesign(actor, design),
  };
}

/** What a download needs: the bytes (checked against their hash), their type and a safe name. */
export type AttachmentDownload = { bytes: Buffer; mime: string; fileName: string; sha256: string };

/** An attachment's bytes for download (every team member). @throws 404 when the row or its bytes are missing. */
export async function getAttachmentDownload(id: number): Promise<AttachmentDownload> {
  const row = await Attachment.findByPk(id);
  if (!row) throw notFound('Attachment');
  const bytes = await withUploadErrors(() => getContentStore().get(row.sha256, { verify: true }));
  return { bytes, mime: row.mime, fileName: row.fileName, sha256: row.sha256 };
}

/**
 * Deletes a design attachment (uploader, design owner or admin). The row goes in a transaction; after the commit
 * the bytes are removed when no other attachment, recording or sheet refers to them.
 */
export async function deleteAttachment(actor: PublicUser, id: number): Promise<void> {
  const existing = (await Attachment.findByPk(id, {
    include: [{ model: Design, as: 'design', attributes: ['id', 'ownerId'] }],
  })) as AttachmentRow | null;
  if (!existing) throw notFound('Attachment');
  if (existing.designId === null) {
    throw new AppError('not_deletable', 'This file is the source of a motor torque table; upload a new table instead.', 409);
  }
  assertMayDeleteAttachment(actor, existing, existing.design ?? null);

  await getSequelize().transaction(async (transaction) => {
    const deleted = await Attachment.destroy({ where: { id }, transaction });
    if (deleted === 0) throw notFound('Attachment');
    await recordAudit(
      {
        actorId: actor.id,
        action: 'attachment.delete',
        entity: 'attachment',
        entityId: id,
        fromState: `design ${existing.designId}`,
        reason: `${existing.fileName} (SHA-256 ${existing.sha256})`,
      },
      transaction,
    );
  });
  // Only after the commit, and only when nothing else refers to the same bytes.
  await removeUnreferencedBytes([existing.sha256]);
}

/** Newest source file of a motor's torque table, or null. */
export async function latestPartAttachment(partId: number): Promise<Attachment | null> {
  return Attachment.findOne({
    where: { partId, designId: { [Op.is]: null } },
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    include: [UPLOADER_INCLUDE],
  });
}
