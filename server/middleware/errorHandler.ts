import type { ErrorRequestHandler } from 'express';
import { ZodError } from 'zod';
import {
  BaseError as SequelizeError,
  ConnectionError,
  ForeignKeyConstraintError,
  UniqueConstraintError,
  ValidationError as SequelizeValidationError,
} from 'sequelize';
import { AppError, type ErrorDetails } from '../errors';
import { logger } from '../logger';
import { zodDetails } from './validate';

type ErrorBody = { error: { code: string; message: string; details?: ErrorDetails } };

/** Errors thrown by body-parser / http-errors carry `type`, `status` and `expose`. */
type HttpLikeError = Error & {
  type?: string;
  status?: number;
  statusCode?: number;
  expose?: boolean;
  limit?: number;
  code?: string;
  field?: string;
};

function formatBytes(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB` : `${Math.round(bytes / 1024)} kB`;
}

/** Driver error codes that mean the connection to MariaDB went away mid-query (the query may or may not have run). */
const LOST_CONNECTION_CODES = new Set([
  'ER_CONNECTION_KILLED', // 1927: KILL CONNECTION, or a server shutting down
  'ER_SERVER_SHUTDOWN', // 1053
  'ER_SOCKET_UNEXPECTED_CLOSE',
  'ER_CONNECTION_ALREADY_CLOSED',
  'ER_CMD_CONNECTION_CLOSED',
  'ER_CLOSED_POOL',
  'ER_GET_CONNECTION_TIMEOUT',
  'ECONNRESET',
  'ECONNREFUSED',
  'EPIPE',
  'ETIMEDOUT',
]);

/**
 * True for a query that failed because the connection was lost (not because of the query): the driver marks such
 * errors `fatal`, gives them SQLSTATE class 08 (connection exception) or one of the codes above. Sequelize only maps
 * connection errors at connect time to ConnectionError; one cut mid-query arrives as a plain DatabaseError.
 */
export function isLostConnection(err: unknown): boolean {
  if (!(err instanceof SequelizeError)) return false;
  const parent = (err as { parent?: { fatal?: boolean; sqlState?: string; code?: string } }).parent;
  if (!parent) return false;
  return parent.fatal === true || (parent.sqlState ?? '').startsWith('08') || LOST_CONNECTION_CODES.has(parent.code ?? '');
}

/** Maps a thrown value to a status and JSON body. Unknown errors map to 500 (and are flagged as bugs). */
export function toErrorResponse(err: unknown, requestId?: string): { status: number; body: ErrorBody; isBug: boolean } {
  const reply = (status: number, code: string, message: string, details?: ErrorDetails) => ({
    status,
    body: { error: details ? { code, message, details } : { code, message } },
    isBug: false,
  });

  if (err instanceof AppError) return { ...reply(err.status, err.code, err.message, err.details), isBug: !err.isOperational };
  if (err instanceof ZodError) return reply(400, 'validation_failed', 'The request is not valid.', zodDetails(err));

  const e = err as HttpLikeError;
  if (e && typeof e === 'object') {
    switch (e.type) {
      case 'entity.parse.failed':
        return reply(400, 'invalid_json', 'The request body is not valid JSON.');
      case 'entity.too.large':
        return reply(413, 'payload_too_large', `The request body is too large (limit ${formatBytes(e.limit ?? 1024 * 1024)}).`);
      case 'encoding.unsupported':
      case 'charset.unsupported':
        return reply(415, 'unsupported_media_type', e.message);
      case 'request.aborted':
      case 'request.size.invalid':
        return reply(400, 'bad_request', 'The request body was incomplete.');
      default:
        break;
    }
    if (e.name === 'EngineInputError') return reply(400, 'invalid_input', e.message);
    if (e.name === 'MulterError') {
      const tooLarge = e.code === 'LIMIT_FILE_SIZE';
      return reply(
        tooLarge ? 413 : 400,
        tooLarge ? 'payload_too_large' : 'invalid_upload',
        e.field ? `${e.message} (field ${e.field})` : e.message,
      );
    }
  }
  if (err instanceof UniqueConstraintError) {
    const details = err.errors.map((item) => ({ path: item.path ?? 'unknown', message: 'is already taken' }));
    return reply(409, 'conflict', 'A record with the same unique value already exists.', details);
  }
  if (err instanceof SequelizeValidationError) {
    return reply(
      400,
      'validation_failed',
      'The data is not valid.',
      err.errors.map((item) => ({ path: item.path ?? 'unknown', message: item.message })),
    );
  }
  if (err instanceof ForeignKeyConstraintError)
    return reply(409, 'conflict', 'The record refers to, or is referred to by, another record.');
  if (err instanceof ConnectionError || isLostConnection(err)) {
    return { ...reply(503, 'db_unavailable', 'The database is not reachable. Try again shortly.'), isBug: false };
  }
  // A path segment with broken percent-encoding ("/api/designs/%E0%A4%A"): the router could not decode it.
  if (err instanceof URIError && (err as HttpLikeError).status === 400) {
    return reply(400, 'bad_request', 'The address contains broken percent-encoding.');
  }
  if (e && typeof e === 'object' && e.expose && typeof (e.status ?? e.statusCode) === 'number') {
    const status = (e.status ?? e.statusCode) as number;
    if (status >= 400 && status < 500) return reply(status, 'bad_request', e.message);
  }
  const suffix = requestId ? ` (request id ${requestId})` : '';
  return { ...reply(500, 'internal_error', `Something went wrong on the server. The error has been logged${suffix}.`), isBug: true };
}

/**
 * The single, last error middleware: answers `{ error: { code, message, details? } }`.
 * Keep all four parameters: Express recognises error middleware by its arity.
 * Unknown errors are logged with stack and request id and answered with 500. The process keeps serving:
 * the API holds no in-process state a failed request could leave half-changed (all state is in MariaDB,
 * where multi-step changes run in transactions). Errors outside requests crash the process (server/index.ts).
 */
export function errorHandlerMiddleware(): ErrorRequestHandler {
  return function errorHandler(err, req, res, next) {
    if (res.headersSent) {
      next(err);
      return;
    }
    const { status, body, isBug } = toErrorResponse(err, req.id);
    if (isBug) logger.error({ err, reqId: req.id, method: req.method, url: req.originalUrl }, 'unhandled error');
    else if (status >= 500) logger.warn({ err, reqId: req.id }, body.error.message);
    // A database that is away (failover in progress) usually answers again within seconds.
    if (status === 503) res.setHeader('Retry-After', '2');
    res.status(status).json(body);
  };
}
