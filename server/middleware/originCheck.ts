import type { Request, RequestHandler } from 'express';
import { getConfig } from '../config';
import { AppError } from '../errors';

/** Methods that change state: every one of them must come from the app's own pages. */
const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** What a browser says in Sec-Fetch-Site for a request its own page (or the user, typing) started. */
const OWN_SITE_VALUES = new Set(['same-origin', 'none']);

function originOf(url: string): string | null {
  try {
    return new URL(url).origin;
  } catch {
    return null;
  }
}

/** The origin the browser addressed: scheme and Host of this request (behind a proxy, with TRUST_PROXY). */
function requestOrigin(req: Request): string | null {
  const host = req.get('host');
  return host ? originOf(`${req.protocol}://${host}`) : null;
}

function refused(why: string): AppError {
  return new AppError(
    'cross_site_request',
    `This request came from another site (${why}), so it was not carried out. Use Gantrywright's own pages.`,
    403,
  );
}

/**
 * Refuses state-changing API requests that another site started (CSRF; issue 12, item 3). For POST, PUT, PATCH and
 * DELETE:
 * - when the browser sends `Sec-Fetch-Site` (every current one does), it must be `same-origin` (or `none`: typed by
 *   the user); `cross-site` and `same-site` (a sibling subdomain) are refused;
 * - otherwise, when it sends `Origin`, that must be APP_URL's origin or the origin the request was addressed to
 *   (its scheme and Host); `Origin: null` (sandboxed frames, some redirects) is refused;
 * - a request with neither header did not come from a browser page (curl, scripts, tests): it passes, and the
 *   session cookie, SameSite=Strict, is not sent on cross-site requests by browsers anyway.
 * Answers 403 `cross_site_request` with the usual error shape. Put it before the body parsers, so a refused upload
 * is never read.
 */
export function originCheckMiddleware(): RequestHandler {
  const appOrigin = originOf(getConfig().appUrl);
  return function originCheck(req, _res, next) {
    if (!STATE_CHANGING.has(req.method)) {
      next();
      return;
    }
    const fetchSite = req.get('sec-fetch-site');
    if (fetchSite !== undefined) {
      next(OWN_SITE_VALUES.has(fetchSite.toLowerCase()) ? undefined : refused(`Sec-Fetch-Site: ${fetchSite.slice(0, 20)}`));
      return;
    }
    const origin = req.get('origin');
    if (origin !== undefined) {
      const isOwn = origin !== 'null' && (origin === appOrigin || origin === requestOrigin(req));
      next(isOwn ? undefined : refused(`Origin: ${origin.slice(0, 80)}`));
      return;
    }
    next();
  };
}
