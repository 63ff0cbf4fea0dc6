import fs from 'node:fs/promises';
import path from 'node:path';
import type { NextFunction, Request, RequestHandler, Response } from 'express';

/** Encodings written at build time (scripts/vitePrecompress.ts), best first. */
const ENCODINGS = [
  { name: 'br', ext: '.br' },
  { name: 'gzip', ext: '.gz' },
] as const;

/** Hashed build output: its content never changes under the same name. */
const IMMUTABLE = 'public, max-age=31536000, immutable';

/**
 * Which of the build's encodings the request accepts, best first ("br;q=0" and "gzip;q=0" count as refusals).
 * @param header - the Accept-Encoding header
 */
export function acceptedEncodings(header: string | undefined): ('br' | 'gzip')[] {
  if (!header) return [];
  const accepted = new Map<string, number>();
  for (const part of header.split(',')) {
    const [name, ...params] = part.trim().toLowerCase().split(';');
    const q = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
    accepted.set(name, q ? Number(q.slice(2)) : 1);
  }
  const ok = (name: string) => (accepted.get(name) ?? (accepted.has('*') ? accepted.get('*')! : 0)) > 0;
  return ENCODINGS.filter((e) => ok(e.name)).map((e) => e.name);
}

async function isFile(file: string): Promise<boolean> {
  try {
    return (await fs.stat(file)).isFile();
  } catch {
    return false;
  }
}

/**
 * Sends a built file, precompressed when the browser accepts brotli or gzip and the build wrote that variant:
 * `Content-Encoding`, `Vary: Accept-Encoding`, the original file's type, and `cacheControl`. Returns false when
 * `file` does not exist, so the caller can fall through.
 * @param req - the request
 * @param res - the response
 * @param file - absolute path of the uncompressed file
 * @param cacheControl - Cache-Control value
 */
export async function sendBuilt(req: Request, res: Response, file: string, cacheControl: string): Promise<boolean> {
  if (!(await isFile(file))) return false;
  res.setHeader('Vary', 'Accept-Encoding');
  res.setHeader('Cache-Control', cacheControl);
  res.type(path.extname(file));
  let chosen = file;
  for (const encoding of acceptedEncodings(req.headers['accept-encoding'])) {
    const variant = `${file}${ENCODINGS.find((e) => e.name === encoding)!.ext}`;
    if (await isFile(variant)) {
      res.setHeader('Content-Encoding', encoding);
      chosen = variant;
      break;
    }
  }
  await new Promise<void>((resolve, reject) => {
    // The type and caching are set above; send() keeps a Content-Type that is already there.
    res.sendFile(chosen, { lastModified: true, etag: true, cacheControl: false, dotfiles: 'allow' }, (err) =>
      err ? reject(err) : resolve(),
    );
  });
  return true;
}

/**
 * Serves the built client's hashed assets (`/assets/*`) from `distDir` with their precompressed variants and
 * a year of immutable caching. Everything else goes on to the next handler (express.static and the SPA fallback).
 * @param distDir - the build output folder
 */
export function precompressedAssetsMiddleware(distDir: string): RequestHandler {
  const assets = path.join(distDir, 'assets');
  return async function precompressedAssets(req: Request, res: Response, next: NextFunction): Promise<void> {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || !req.path.startsWith('/assets/')) {
      next();
      return;
    }
    let relative: string;
    try {
      relative = decodeURIComponent(req.path.slice('/assets/'.length));
    } catch {
      next();
      return;
    }
    const file = path.resolve(assets, relative);
    // Only plain files directly under assets/ (no traversal, no asking for the .br file itself).
    if (path.dirname(file) !== assets || /\.(br|gz)$/.test(file)) {
      next();
      return;
    }
    try {
      if (!(await sendBuilt(req, res, file, IMMUTABLE))) next();
    } catch (err) {
      next(err);
    }
  };
}
