import express, { type RequestHandler } from 'express';
import type { z } from 'zod';
import { AppError } from '../errors';

/**
 * Reads a JSON body as bytes without parsing it (req.body becomes a Buffer, or stays undefined without a body),
 * for routes that parse and validate in a worker thread. Same limit and media types as the API's JSON parser,
 * and like it, only UTF-8 is accepted.
 * @param limit - largest body, e.g. "1mb"
 * @param types - media types read
 * @param schemas - what the worker validates the body against: readable on the middleware (`.schemas`) like
 *   validate()'s, so tests that walk the real router know what the route takes
 */
export function rawJsonBodyMiddleware(limit: string, types: string[], schemas: { body: z.ZodType }): RequestHandler[] {
  return [
    function utf8Only(req, _res, next) {
      const charset = /;\s*charset=("?)([^";]+)\1/i.exec(req.headers['content-type'] ?? '')?.[2];
      if (charset && !/^utf-?8$/i.test(charset))
        next(new AppError('unsupported_media_type', `unsupported charset "${charset.toUpperCase()}"`, 415));
      else next();
    },
    Object.assign(express.raw({ limit, type: types }), { schemas }),
  ];
}
