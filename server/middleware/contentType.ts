import type { RequestHandler } from 'express';
import { AppError } from '../errors';

const BODY_METHODS = new Set(['POST', 'PUT', 'PATCH']);

/** Largest JSON body the API accepts; bigger ones get 413 `payload_too_large`. */
export const JSON_BODY_LIMIT = '1mb';

/** Media types the API reads as JSON. */
export const JSON_TYPES = ['application/json', 'application/*+json'];

/**
 * Rejects a request body that is neither JSON nor multipart/form-data with 415, instead of letting it
 * arrive as an empty body and fail validation with a confusing message.
 */
export function requireJsonBodyMiddleware(): RequestHandler {
  return function requireJsonBody(req, _res, next) {
    const hasBody = Number(req.headers['content-length'] ?? 0) > 0 || req.headers['transfer-encoding'] !== undefined;
    if (!BODY_METHODS.has(req.method) || !hasBody || req.is(['application/json', 'application/*+json', 'multipart/form-data'])) {
      next();
      return;
    }
    next(
      new AppError(
        'unsupported_media_type',
        `Send the request body as application/json (got ${req.headers['content-type'] ?? 'no content type'}).`,
        415,
      ),
    );
  };
}
