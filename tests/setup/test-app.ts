/**
 * createApp on a test database, for supertest: the real app, a real PostgreSQL database, real SMTP
 * to a local capture. TRUSTED_ORIGIN stands for the browser origin of the app in these tests; unsafe
 * requests carry it as Origin (the CSRF check) unless a test is about the check itself.
 */
import type { Express } from 'express';
import { createApp, type AppDeps } from '../../server/app';
import { createDb, type Db } from '../../server/db/client';
import { createMailer } from '../../server/lib/mail';
import { startMailCapture, type MailCapture } from '../../server/lib/mail-capture';
import { createLogger } from '../../server/lib/logger';
import { createTestDatabase } from './test-db';
import type pg from 'pg';

/** Test logs stay quiet unless FRINGEWALK_TEST_LOG_LEVEL asks for them. */
export const testLogger = () => createLogger(process.env.FRINGEWALK_TEST_LOG_LEVEL ?? 'silent');

export const TEST_SESSION_SECRET = 'test-session-secret-that-is-long-enough-0123456789';

export const TRUSTED_ORIGIN = 'http://127.0.0.1:5180';

export interface InProcessApp {
  app: Express;
  db: Db;
  pool: pg.Pool;
  databaseUrl: string;
  capture: MailCapture;
  close(): Promise<void>;
}

export async function createTestApp(options: { seed?: (db: Db) => Promise<unknown>; rateLimits?: AppDeps['rateLimits'] } = {}): Promise<InProcessApp> {
  const database = await createTestDatabase();
  const { pool, db } = createDb(database.url, { onIdleError: () => {} });
  if (options.seed) {
    try {
      await options.seed(db);
    } catch (error) {
      await pool.end();
      await database.drop();
      throw error;
    }
  }
  const capture = await startMailCapture();
  const mailer = createMailer({ smtpUrl: capture.url, from: 'Fringewalk test <no-reply@fringewalk.invalid>' });
  const { app, close } = createApp({
    db,
    pool,
    logger: testLogger(),
    mailer,
    mailCapture: capture,
    publicUrl: TRUSTED_ORIGIN,
    trustedOrigins: [TRUSTED_ORIGIN],
    sessionSecret: TEST_SESSION_SECRET,
    rateLimits: options.rateLimits,
  });
  return {
    app,
    db,
    pool,
    databaseUrl: database.url,
    capture,
    async close() {
      await close();
      mailer.close();
      await capture.close();
      await pool.end();
      await database.drop();
    },
  };
}

/** Limits high enough that a test signing in many times is not stopped (the rate-limit test sets its own). */
export const RELAXED_RATE_LIMITS: AppDeps['rateLimits'] = {
  signInPerIp: { max: 10_000, windowMs: 60_000 },
  signInPerEmail: { max: 10_000, windowMs: 60_000 },
  resetPerIp: { max: 10_000, windowMs: 60_000 },
  resetPerEmail: { max: 10_000, windowMs: 60_000 },
};
