import type { RequestHandler } from 'express';
import multer from 'multer';
import { AppError } from '../errors';

/** Options of {@link uploadMiddleware}. */
export type UploadOptions = {
  /** Largest file accepted [bytes]; a bigger one is answered with 413 `payload_too_large`. */
  maxBytes: number;
  /** Form field that carries the file (default `file`). */
  field?: string;
  /** Words for the file in messages ("recording", "torque table"…; default "file"). */
  what?: string;
};

/** The file a multipart request carried, as handed to services (no multer types below the route layer). */
export type UploadedFile = {
  /** The client's file name (never used as a path). */
  originalName: string;
  /** The Content-Type the client declared for the part. */
  declaredMime: string;
  bytes: Buffer;
};

/** Room for the other form fields and the multipart framing on top of the file itself [bytes]. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;
const MAX_TEXT_FIELDS = 10;
const MAX_TEXT_FIELD_BYTES = 1024;

/** "2 MB", "64 kB". */
export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;
  return `${Math.round(bytes / 1024)} kB`;
}

function tooLarge(what: string, maxBytes: number): AppError {
  return new AppError('payload_too_large', `The ${what} is too large: at most ${formatBytes(maxBytes)} is accepted.`, 413, {
    details: [{ path: 'file', message: `must be at most ${formatBytes(maxBytes)}` }],
  });
}

/**
 * Parses a multipart/form-data request holding at most one file into memory (multer memory storage: bytes never
 * touch the disk before they are checked) and puts it on `req.file`; text fields land on `req.body`.
 * Requests that are not multipart pass through untouched (a JSON body was already parsed).
 *
 * Answers: 413 `payload_too_large` when the file (or the declared request length) exceeds `maxBytes`;
 * 400 `invalid_upload` for a second file, a file in another field, or too many/too long text fields.
 * Put it after the role check, so nobody unauthorised gets to send megabytes.
 */
export function uploadMiddleware(options: UploadOptions): RequestHandler {
  const field = options.field ?? 'file';
  const what = options.what ?? 'file';
  const parse = multer({
    storage: multer.memoryStorage(),
    // Browsers send file names as raw UTF-8 in the part header; multer's default would read them as Latin-1.
    defParamCharset: 'utf8',
    limits: {
      fileSize: options.maxBytes,
      files: 1,
      fields: MAX_TEXT_FIELDS,
      fieldSize: MAX_TEXT_FIELD_BYTES,
      parts: MAX_TEXT_FIELDS + 1,
    },
  }).single(field);

  return function uploadFileMiddleware(req, res, next) {
    if (!req.is('multipart/form-data')) {
      next();
      return;
    }
    // A declared length far above the limit is refused before reading a byte of it.
    const declared = Number(req.headers['content-length'] ?? NaN);
    if (Number.isFinite(declared) && declared > options.maxBytes + MULTIPART_OVERHEAD_BYTES) {
      // The client is still sending: read and discard the rest, so it gets the answer instead of a reset
      // connection, and close the connection after it.
      res.setHeader('Connection', 'close');
      req.resume();
      next(tooLarge(what, options.maxBytes));
      return;
    }
    parse(req, res, (err: unknown) => {
      if (!err) {
        next();
        return;
      }
      const e = err as { name?: string; code?: string; field?: string; message?: string };
      if (e.name !== 'MulterError') {
        // Everything else comes from reading the form itself (busboy): no boundary, a truncated body, a broken part
        // header. The client sent a form that cannot be read — a 400, not a server fault (issue 12, item 9).
        next(
          new AppError(
            'invalid_upload',
            `The upload form could not be read (${(e.message ?? 'malformed multipart body').slice(0, 120)}).`,
            400,
            {
              details: [{ path: 'body', message: 'is not a complete multipart/form-data body; send the form again' }],
            },
          ),
        );
        return;
      }
      switch (e.code) {
        case 'LIMIT_FILE_SIZE':
          // multer stops parsing and drains the rest of the request itself.
          next(tooLarge(what, options.maxBytes));
          return;
        case 'LIMIT_UNEXPECTED_FILE':
          next(
            new AppError('invalid_upload', `Send one ${what} in the form field "${field}".`, 400, {
              details: [{ path: e.field ?? field, message: `unexpected file; send a single file in "${field}"` }],
            }),
          );
          return;
        case 'LIMIT_FILE_COUNT':
          next(
            new AppError('invalid_upload', `Send a single ${what}.`, 400, {
              details: [{ path: field, message: 'only one file is accepted' }],
            }),
          );
          return;
        default:
          next(
            new AppError('invalid_upload', 'The upload form is not valid (too many or too long fields).', 400, {
              details: [{ path: e.field ?? 'body', message: 'too many or too long form fields' }],
            }),
          );
      }
    });
  };
}

/**
 * The uploaded file of a request in the shape services take, or null when none was sent.
 * @param file - `req.file` after {@link uploadMiddleware}
 */
export function uploadedFile(file: Express.Multer.File | undefined): UploadedFile | null {
  if (!file) return null;
  return { originalName: file.originalname, declaredMime: file.mimetype, bytes: file.buffer };
}
