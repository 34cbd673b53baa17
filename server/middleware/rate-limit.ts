/**
 * Limits on the endpoints that cost a password hash or send an e-mail. Counted per client IP and
 * per e-mail address (so one address cannot be hammered from many IPs, nor many addresses from one).
 * The counters live in memory (express-rate-limit's MemoryStore): good for one server process; with
 * several instances behind a load balancer each keeps its own count, so swap in a shared store then.
 */
import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { AppError } from '../lib/errors';

export interface RateLimits {
  signInPerIp: { max: number; windowMs: number };
  signInPerEmail: { max: number; windowMs: number };
  resetPerIp: { max: number; windowMs: number };
  resetPerEmail: { max: number; windowMs: number };
}

const FIFTEEN_MINUTES_MS = 15 * 60 * 1000;
const ONE_HOUR_MS = 60 * 60 * 1000;

/** Failed sign-ins only count; a successful one does not use up the allowance. */
export const DEFAULT_RATE_LIMITS: RateLimits = {
  signInPerIp: { max: 50, windowMs: FIFTEEN_MINUTES_MS },
  signInPerEmail: { max: 5, windowMs: FIFTEEN_MINUTES_MS },
  resetPerIp: { max: 20, windowMs: ONE_HOUR_MS },
  resetPerEmail: { max: 3, windowMs: ONE_HOUR_MS },
};

function ipKey(req: Request): string {
  return `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`;
}

function emailKey(req: Request): string {
  const email = (req.body as { email?: unknown } | undefined)?.email;
  return typeof email === 'string' ? `email:${email.trim().toLowerCase()}` : ipKey(req);
}

function limiter(limit: { max: number; windowMs: number }, by: 'ip' | 'email', failuresOnly: boolean): RequestHandler {
  return rateLimit({
    windowMs: limit.windowMs,
    limit: limit.max,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: failuresOnly,
    keyGenerator: by === 'ip' ? ipKey : emailKey,
    handler(_req, _res, next, options) {
      const minutes = Math.max(1, Math.ceil(options.windowMs / 60_000));
      next(new AppError('RATE_LIMITED', `Too many attempts. Wait up to ${minutes} minutes and try again.`));
    },
  });
}

export function createRateLimiters(limits: RateLimits) {
  return {
    signInPerIp: limiter(limits.signInPerIp, 'ip', true),
    signInPerEmail: limiter(limits.signInPerEmail, 'email', true),
    resetPerIp: limiter(limits.resetPerIp, 'ip', false),
    resetPerEmail: limiter(limits.resetPerEmail, 'email', false),
  };
}
export type RateLimiters = ReturnType<typeof createRateLimiters>;
