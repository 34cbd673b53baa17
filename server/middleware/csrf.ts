/**
 * CSRF defence for cookie sessions: every unsafe request must name, in Origin (or failing that
 * Referer), an origin we trust. Browsers always send Origin on cross-site and fetch() POSTs, and a
 * page on another site cannot forge it. SameSite=Lax on the cookie is the second layer.
 * (OWASP CSRF Prevention Cheat Sheet, "Verifying Origin With Standard Headers".)
 */
import type { RequestHandler } from 'express';
import { AppError } from '../lib/errors';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

function originOf(value: string | undefined): string | null {
  if (!value || value === 'null') return null;
  try {
    return new URL(value).origin;
  } catch {
    return null;
  }
}

export function csrfOriginCheck(trustedOrigins: readonly string[]): RequestHandler {
  const trusted = new Set(trustedOrigins.map((o) => new URL(o).origin));
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const origin = originOf(req.get('origin')) ?? originOf(req.get('referer'));
    if (origin && trusted.has(origin)) return next();
    next(new AppError('CSRF_ORIGIN_MISMATCH', 'This request did not come from the Fringewalk app, so it was refused.'));
  };
}
