import type { AttachmentPage, PublicAttachment } from '@/contracts';
import { Op, type Transaction } from 'sequelize';
import { getSequelize } from '../db';
import { AppError, notFound } from '../errors';
import { logger } from '../logger';
import type { UploadedFile } from '../uploads/uploadedFile';
import { Attachment, Design, User, type AttachmentMime } from '../models';
import { getContentStore, markUnreferenced, referenceContent, removeUnreferencedContent } from '../storage';
import { assertTypeMatches, ContentStoreError, CsvError, PluckError, sha256Of, UploadTypeError, type SniffedMime } from '../uploads';
import { assertMayAttach as assertMayAttachTo, assertMayDeleteAttachment, mayChangeDesign, mayDeleteAttachment } from './access';
import { recordAudit } from './audit.service';
import type { PublicUser } from './users.service';

/** Largest design attachment [bytes] (issue 6: 10 MB). */
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;

/** What a design may take: datasheets, photos and tables, recognised from their bytes. */
export const ATTACHMENT_TYPES: readonly SniffedMime[] = ['application/pdf', 'image/png', 'image/jpeg', 'text/csv'];

type AttachmentRow = Attachment & { uploadedBy?: User | null; design?: Design | null };

/**
 * Turns the errors of the pure upload modules into API errors: 415 for a refused type, 422 for a recording that
 * cannot be measured, 400 with line/column details for a torque table, 404/400 for a bad content address.
 * Anything else is returned unchanged (a bug, answered with 500 by the central handler).
 */
export function toUploadAppError(err: unknown): unknown {
  if (err instanceof UploadTypeError) {
    return new AppError(err.code === 'empty_file' ? 'empty_file' : 'unsupported_media_type', err.message, 415, {
      details: [{ path: 'file', message: err.message }],
    });
  }
  if (err instanceof PluckError)
    return new AppError(`recording_${err.code}`, err.message, 422, { details: [{ path: 'file', message: err.message }] });
  if (err instanceof CsvError) {
    return new AppError('invalid_csv', err.message, 400, {
      details: err.details.map((d) => ({
        path: ['file', d.line !== null ? `line ${d.line}` : null, d.column].filter(Boolean).join(' · '),
        message: d.message,
        line: d.line,
        column: d.column,
      })),
    });
  }
  if (err instanceof ContentStoreError) {
    return new AppError(
      err.code === 'not_found' ? 'file_missing' : err.code,
      err.code === 'not_found' ? 'The stored file is missing.' : err.message,
      err.httpStatus,
      {
        isOperational: err.code !== 'corrupt',
      },
    );
  }
  return err;
}

/** Runs `fn`, mapping upload-module errors to API errors. */
export async function withUploadErrors<T>(fn: () => Promise<T> | T): Promise<T> {
  try {
    return await fn();
  } catch (err) {
    throw toUploadAppError(err);
  }
}

const CONTROL_CHARS = /[\u0000-\u001f\u007f-\u009f]/g;
const CANONICAL_EXT: Record<string, string> = {
  'application/pdf': 'pdf',
  'image/png': 'png',
  'image/jpeg': 'jpg',
  'text/csv': 'csv',
  'text/plain': 'txt',
  'audio/wav': 'wav',
};

/**
 * A file name safe to store and to send in Content-Disposition: the last segment of whatever path the client sent,
 * without control characters, quotes, backslashes or characters Windows refuses, leading dots or trailing
 * spaces/dots, at most 150 characters (the extension kept). Names that end up empty become `attachment.<ext>`.
 * @param name - the client's file name
 * @param mime - the sniffed type, for the fallback extension
 */
export function sanitiseFileName(name: string, mime: string): string {
  const ext = CANONICAL_EXT[mime] ?? 'bin';
  const last =
    String(name ?? '')
      .split(/[/\\]/)
      .pop() ?? '';
  let clean = last
    .normalize('NFC')
    .replace(CONTROL_CHARS, '')
    .replace(/["<>:|?*]/g, '_')
    .replace(/\s+/g, ' ')
    .trim()
    .replace(/^[.\s]+/, '')
    .replace(/[.\s]+$/, '');
  if (!clean) return `attachment.${ext}`;
  if (!clean.includes('.')) clean = `${clean}.${ext}`;
  if (clean.length > 150) {
    const dot = clean.lastIndexOf('.');
    const tail = dot > 0 && clean.length - dot <= 10 ? clean.slice(dot) : '';
    clean = `${clean.slice(0, 150 - tail.length).trimEnd()}${tail}`;
  }
  return clean;
}

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

/**
 * Stores bytes in the content store (local folder or S3 bucket) as part of a database transaction that has already
 * inserted the row(s) that refer to them, so the store and the tables change together: each hash is registered as
 * in use (server/storage/contentRegistry.ts, which keeps a concurrent removal of the same bytes from winning on any
 * process or database node) and its bytes are put after every check passed and before the commit. If the
 * transaction fails for good, bytes that nothing refers to are removed again ("nothing saved on failure").
 * The callback may run more than once (a write conflict on a database cluster runs the whole transaction again).
 * @param bytes - one buffer, or several (a sheet's two PDFs)
 */
export async function storeWithRows<T>(
  bytes: Buffer | Buffer[],
  insertRows: (transaction: Transaction, sha256: string) => Promise<T>,
): Promise<T> {
  const buffers = Array.isArray(bytes) ? bytes : [bytes];
  const first = sha256Of(buffers[0]);
  return storeWithRowsMaking(async (transaction) => ({ result: await insertRows(transaction, first), bytes: buffers }));
}

/**
 * {@link storeWithRows} for bytes that are only made inside the transaction: `work` writes the rows and returns the
 * bytes they refer to (an approval renders its sheet while it holds the design's lock), which are then registered
 * and put before the commit. When a retried attempt made other bytes than the one that committed (a PDF's creation
 * time), the earlier attempt's bytes are removed once nothing refers to them.
 */
export async function storeWithRowsMaking<T>(work: (transaction: Transaction) => Promise<{ result: T; bytes: Buffer[] }>): Promise<T> {
  const store = getContentStore();
  const put = new Set<string>();
  let kept: string[] = [];
  try {
    const result = await getSequelize().transaction(async (transaction) => {
      const made = await work(transaction);
      const hashes = made.bytes.map((b) => sha256Of(b));
      for (const [i, buffer] of made.bytes.entries()) {
        await referenceContent(hashes[i], buffer.length, transaction);
        put.add(hashes[i]);
        await store.put(buffer);
      }
      kept = hashes;
      return made.result;
    });
    const stale = [...put].filter((h) => !kept.includes(h));
    if (stale.length) await removeUnreferencedBytes(stale);
    return result;
  } catch (err) {
    if (put.size) await removeUnreferencedBytes([...put]);
    throw err;
  }
}

/**
 * After rows that referred to stored bytes were deleted and committed (an attachment, a design's attachments
 * cascaded with the design), or a transaction that stored them failed: removes the bytes of each hash that no
 * attachment, recording or sheet refers to any more, safely against a concurrent upload of the same bytes on any
 * process (see server/storage/contentRegistry.ts). Never throws: the delete already happened, so a failed
 * cleanup only leaves bytes for the periodic sweeper and is logged.
 * @param sha256s - hashes of the deleted rows (duplicates are fine)
 */
export async function removeUnreferencedBytes(sha256s: readonly string[]): Promise<void> {
  const orphaned: string[] = [];
  for (const sha256 of new Set(sha256s)) {
    try {
      if (await markUnreferenced(sha256)) orphaned.push(sha256);
    } catch (err) {
      logger.warn({ err, sha256 }, 'could not check references of stored bytes');
    }
  }
  await removeUnreferencedContent(orphaned, getContentStore());
}

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
