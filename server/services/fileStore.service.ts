import type { Transaction } from 'sequelize';
import { getSequelize } from '../db';
import { AppError } from '../errors';
import { logger } from '../logger';
import { getContentStore, markUnreferenced, referenceContent, removeUnreferencedContent } from '../storage';
import { ContentStoreError, CsvError, PluckError, sha256Of, UploadTypeError } from '../uploads';

/**
 * The file store every upload goes through (design attachments, job and torque tables, pluck recordings, sheets):
 * bytes kept under their SHA-256 in the content store, put in the same transaction as the rows that refer to them
 * and removed once nothing does; upload errors turned into API errors; safe file names. Knows nothing of designs
 * or who may upload: attachments.service.ts and the other services decide that.
 */

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
