import path from 'node:path';
import express, { type Express, type Request } from 'express';
import cookieParser from 'cookie-parser';
import { getConfig } from './config';
import { getSequelize } from './db';
import { DIST_DIR } from './paths';
import { requestIdMiddleware } from './middleware/requestId';
import { securityHeadersMiddleware } from './middleware/security';
import { JSON_BODY_LIMIT, JSON_TYPES, requireJsonBodyMiddleware } from './middleware/contentType';
import { originCheckMiddleware } from './middleware/originCheck';
import { errorHandlerMiddleware } from './middleware/errorHandler';
import { notFoundMiddleware } from './middleware/notFound';
import { precompressedAssetsMiddleware, sendBuilt } from './middleware/precompressed';
import { createApiRouter } from './routes';

export { JSON_BODY_LIMIT };

/** /api/calc and its sub-paths (relative to /api), whose bodies the engine workers parse. */
const isCalcPath = (url: string): boolean => /^\/calc(\/|\?|$)/.test(url);

/**
 * Builds the Express app: security headers, request ids, the JSON API under /api and the built
 * client (dist/) with an SPA fallback. Never listens (server/index.ts does; tests use supertest).
 */
export function createApp(): Express {
  const config = getConfig();
  getSequelize(); // binds the models before the first request

  const app = express();
  app.disable('x-powered-by');
  // No ETag hashing: API answers are never cached (Cache-Control: no-store below), so hashing every body (100 kB
  // for a full engine result) is wasted work. The built client's files get their ETags from express.static.
  app.set('etag', false);
  app.set('trust proxy', config.trustProxy);
  app.set('query parser', 'simple');

  app.use(requestIdMiddleware());
  app.use(securityHeadersMiddleware());

  app.use(
    '/api',
    // Before anything reads the body: a request another site started is refused unread (CSRF).
    originCheckMiddleware(),
    requireJsonBodyMiddleware(),
    // /api/calc bodies are parsed in the engine worker pool instead (routes/calc.routes.ts), off the event loop.
    express.json({
      limit: JSON_BODY_LIMIT,
      strict: true,
      type: (req) => !isCalcPath(req.url ?? '') && Boolean((req as Request).is(JSON_TYPES)),
    }),
    cookieParser(),
    function noStore(_req, res, next) {
      res.setHeader('Cache-Control', 'no-store');
      next();
    },
    createApiRouter(),
  );

  mountClient(app);
  app.use(notFoundMiddleware());
  app.use(errorHandlerMiddleware());
  return app;
}

/**
 * Serves dist/: hashed assets precompressed (brotli or gzip, written at build) and cached for a year, other
 * files as they are, index.html (also precompressed) revalidated on every visit, SPA fallback for page routes.
 */
function mountClient(app: Express): void {
  app.use(precompressedAssetsMiddleware(DIST_DIR));
  app.use(
    express.static(DIST_DIR, {
      index: false,
      setHeaders(res, filePath) {
        if (filePath.includes(`${path.sep}assets${path.sep}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
      },
    }),
  );
  app.get('/{*splat}', function spaFallback(req, res, next) {
    // A missing file (has an extension) is a 404, not the app shell.
    if (path.extname(req.path)) {
      next();
      return;
    }
    const indexFile = path.join(DIST_DIR, 'index.html');
    sendBuilt(req, res, indexFile, 'no-cache').then((sent) => {
      if (!sent) res.status(503).type('text/plain').send('The client is not built yet. Run `npm run build` (npm start builds it for you).');
    }, next);
  });
}
