import type { RequestHandler } from 'express';
import helmet from 'helmet';
import { getConfig } from '../config';

/**
 * Security headers (helmet). The CSP allows only the app's own scripts, fonts and styles, plus inline
 * styles (Element Plus and Plotly set style attributes) and data:/blob: images (Plotly exports).
 * HSTS and upgrade-insecure-requests only when the app is served over https.
 */
export function securityHeadersMiddleware(): RequestHandler {
  const isHttps = getConfig().appUrl.startsWith('https://');
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        baseUri: ["'self'"],
        scriptSrc: ["'self'"],
        styleSrc: ["'self'", "'unsafe-inline'"],
        fontSrc: ["'self'", 'data:'],
        imgSrc: ["'self'", 'data:', 'blob:'],
        connectSrc: ["'self'"],
        workerSrc: ["'self'", 'blob:'],
        mediaSrc: ["'self'", 'blob:'],
        objectSrc: ["'none'"],
        frameAncestors: ["'none'"],
        formAction: ["'self'"],
        scriptSrcAttr: ["'none'"],
        ...(isHttps ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    strictTransportSecurity: isHttps ? { maxAge: 15552000, includeSubDomains: true } : false,
    crossOriginEmbedderPolicy: false,
  });
}
