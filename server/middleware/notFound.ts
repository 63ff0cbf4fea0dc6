import type { RequestHandler } from 'express';
import { AppError } from '../errors';

/** Answers any request that no route handled (end of the API router, or a missing file) with a JSON 404. */
export function notFoundMiddleware(): RequestHandler {
  return function notFound(req, _res, next) {
    const target = `${req.method} ${req.originalUrl.split('?')[0]}`;
    const isApi = req.originalUrl.startsWith('/api/') || req.originalUrl === '/api';
    next(new AppError('not_found', isApi ? `No API route for ${target}.` : `Nothing found at ${target}.`, 404));
  };
}
