import type { ZodError } from 'zod';
import type { ErrorDetail, ErrorDetails } from '@/contracts';

// The error body's shapes are part of the contract (src/contracts/common.ts); most of the server imports them from here.
export type { ErrorDetail, ErrorDetails };

/**
 * An expected, operational failure with an HTTP status and a stable machine-readable code.
 * The central error handler turns it into `{ error: { code, message, details? } }`.
 * Anything that is not an AppError (or a known library error) is treated as a bug: logged and answered with 500.
 */
export class AppError extends Error {
  readonly code: string;
  readonly status: number;
  readonly details?: ErrorDetails;
  readonly isOperational: boolean;

  constructor(
    code: string,
    message: string,
    status = 400,
    options: { details?: ErrorDetails; cause?: unknown; isOperational?: boolean } = {},
  ) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.name = 'AppError';
    this.code = code;
    this.status = status;
    this.details = options.details;
    this.isOperational = options.isOperational ?? true;
  }
}

/** 400 with field details, the shape every validation failure uses. */
export function validationError(details: ErrorDetail[], message = 'The request is not valid.'): AppError {
  return new AppError('validation_failed', message, 400, { details });
}

/** 401: no valid session. */
export function unauthenticated(message = 'Sign in first.'): AppError {
  return new AppError('unauthenticated', message, 401);
}

/** 403: signed in but not allowed. */
export function forbidden(message = 'You do not have permission to do this.'): AppError {
  return new AppError('forbidden', message, 403);
}

/** 404 for a named kind of thing. */
export function notFound(what = 'Resource'): AppError {
  return new AppError('not_found', `${what} not found.`, 404);
}

/** 409: the request conflicts with the current state. */
export function conflict(message: string, code = 'conflict'): AppError {
  return new AppError(code, message, 409);
}

/** Turns zod issues into `[{ path: 'field.sub', message }]`. An issue on the whole value gets `rootName`. */
export function zodDetails(error: ZodError, rootName = 'body'): ErrorDetail[] {
  return error.issues.flatMap((issue): ErrorDetail[] => {
    const prefix = issue.path.map(String).join('.');
    // Name each unknown field rather than reporting "Unrecognized key" on the parent object.
    if (issue.code === 'unrecognized_keys') {
      return issue.keys.map((key) => ({ path: prefix ? `${prefix}.${key}` : key, message: 'is not a known field' }));
    }
    if (issue.code === 'invalid_type' && !prefix && issue.expected === 'object') {
      return [{ path: rootName, message: rootName === 'body' ? 'must be a JSON object' : 'must be an object' }];
    }
    return [{ path: prefix || rootName, message: issue.message }];
  });
}
