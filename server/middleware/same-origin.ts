import type { Request, RequestHandler } from 'express';
import { crossSite, unsupportedMediaType } from '../errors.js';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

function ownOrigins(req: Request, appUrl: string | undefined): Set<string> {
  const own = new Set<string>();
  const host = req.get('host');
  if (host) own.add(`${req.protocol}://${host}`);
  if (appUrl) own.add(new URL(appUrl).origin);
  return own;
}

/**
 * Before any route: a request that changes anything comes from Coretrail's own pages and carries
 * JSON (or a multipart form on a route that takes a file). SameSite=Lax alone would let another
 * site on the same host (another port, a sibling subdomain) post with the cookie, and a form or
 * text post would reach a handler whose fields are all optional.
 *
 * The browser says where a request comes from in Origin and Sec-Fetch-Site; a request with neither
 * is not from a browser page (a script, a test stand's uploader) and stays allowed.
 */
export function sameOriginJson(opts: {
  appUrl?: string;
  takesFile: (method: string, path: string) => boolean;
}): RequestHandler {
  return (req, _res, next) => {
    if (SAFE.has(req.method)) return next();
    const site = req.get('sec-fetch-site');
    if (site && site !== 'same-origin' && site !== 'none') return next(crossSite());
    const origin = req.get('origin');
    if (origin !== undefined && !ownOrigins(req, opts.appUrl).has(origin)) return next(crossSite());

    const hasBody = req.get('content-length') !== undefined && req.get('content-length') !== '0';
    const chunked = req.get('transfer-encoding') !== undefined;
    const type = req.get('content-type');
    if (!type) {
      if (hasBody || chunked)
        return next(unsupportedMediaType('Send the body as JSON (Content-Type: application/json).'));
      return next();
    }
    if (req.is('application/json')) return next();
    if (req.is('multipart/form-data') && opts.takesFile(req.method, req.path)) return next();
    next(
      unsupportedMediaType(
        opts.takesFile(req.method, req.path)
          ? 'Send the photo as multipart/form-data in the field "file".'
          : 'Send the body as JSON (Content-Type: application/json).',
      ),
    );
  };
}
