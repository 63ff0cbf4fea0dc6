import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import { logger } from '../logger';

const HEADER = 'X-Request-Id';
/** An id a proxy or client sent is reused only when it looks harmless in a log line. */
const SAFE_ID = /^[A-Za-z0-9._:-]{1,64}$/;

/** Gives every request an id (reusing a sane incoming X-Request-Id), echoes it and logs the finished request. */
export function requestIdMiddleware(): RequestHandler {
  return function requestId(req, res, next) {
    const incoming = req.get(HEADER);
    req.id = incoming && SAFE_ID.test(incoming) ? incoming : randomUUID();
    res.setHeader(HEADER, req.id);
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      logger.info({ reqId: req.id, method: req.method, url: req.originalUrl, status: res.statusCode, ms: Math.round(ms) }, 'request');
    });
    next();
  };
}
