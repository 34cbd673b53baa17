/**
 * Cookie sessions (express-session) stored in PostgreSQL's `session` table (connect-pg-simple), so
 * any server instance can serve any request and a sign-out is final server-side.
 */
import connectPgSimple from 'connect-pg-simple';
import type { RequestHandler, Response } from 'express';
import session from 'express-session';
import type pg from 'pg';
import './types';

export const SESSION_COOKIE = 'fw.sid';
export const SESSION_MAX_AGE_MS = 14 * 24 * 60 * 60 * 1000;
const PRUNE_INTERVAL_S = 15 * 60;
/**
 * A session's stored expiry is moved forward at most once in this long per server instance. The cookie
 * itself keeps the expiry it was given at sign-in (sessions are not rolling), so touching the row on every
 * request would only cost a write per request (a push batch is one request among thousands).
 */
export const SESSION_TOUCH_INTERVAL_MS = 10 * 60 * 1000;
const TOUCH_MEMORY_LIMIT = 10_000;

/** Skips store.touch for a session touched less than SESSION_TOUCH_INTERVAL_MS ago by this instance. */
export function throttleTouch(store: session.Store, now: () => number = Date.now): void {
  const touch = store.touch?.bind(store);
  if (!touch) return;
  const lastTouched = new Map<string, number>();
  store.touch = (sid, sess, done) => {
    // express-session passes an error-first callback, whatever the typings say.
    const callback = done as ((error?: unknown) => void) | undefined;
    const at = now();
    const last = lastTouched.get(sid);
    if (last !== undefined && at - last < SESSION_TOUCH_INTERVAL_MS) {
      callback?.();
      return;
    }
    if (lastTouched.size >= TOUCH_MEMORY_LIMIT) lastTouched.clear();
    lastTouched.set(sid, at);
    touch(sid, sess, (error?: unknown) => {
      if (error) lastTouched.delete(sid);
      callback?.(error);
    });
  };
}

export interface SessionSetup {
  middleware: RequestHandler;
  store: session.Store & { close(): void };
  cookieOptions: { httpOnly: true; sameSite: 'lax'; secure: boolean; path: '/' };
}

export function createSessionMiddleware(options: { pool: pg.Pool; secret: string; secure: boolean }): SessionSetup {
  const PgStore = connectPgSimple(session);
  const store = new PgStore({
    pool: options.pool,
    tableName: 'session',
    createTableIfMissing: false,
    pruneSessionInterval: PRUNE_INTERVAL_S,
    // A failed prune (database restarting) must not crash the process; the next one will catch up.
    errorLog: () => {},
  });
  throttleTouch(store);
  const cookieOptions = { httpOnly: true, sameSite: 'lax', secure: options.secure, path: '/' } as const;
  const middleware = session({
    name: SESSION_COOKIE,
    secret: options.secret,
    store,
    resave: false,
    saveUninitialized: false,
    cookie: { ...cookieOptions, maxAge: SESSION_MAX_AGE_MS },
  });
  return { middleware, store, cookieOptions };
}

export function clearSessionCookie(res: Response, cookieOptions: SessionSetup['cookieOptions']): void {
  res.clearCookie(SESSION_COOKIE, cookieOptions);
}

/** Signs the request's client in as userId under a fresh session id (no session fixation). */
export async function establishSession(req: import('express').Request, userId: string): Promise<void> {
  await new Promise<void>((resolve, reject) => req.session.regenerate((error) => (error ? reject(error) : resolve())));
  req.session.userId = userId;
  await new Promise<void>((resolve, reject) => req.session.save((error) => (error ? reject(error) : resolve())));
}

/** Ends the session server-side (the row is deleted), so a copied cookie is worthless afterwards. */
export async function endSession(req: import('express').Request): Promise<void> {
  if (!req.session) return;
  await new Promise<void>((resolve, reject) => req.session.destroy((error) => (error ? reject(error) : resolve())));
}
