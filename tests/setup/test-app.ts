/**
 * createApp on a test database, for supertest: the real app, a real PostgreSQL database, real SMTP
 * to a local capture. TRUSTED_ORIGIN stands for the browser origin of the app in these tests; unsafe
 * requests carry it as Origin (the CSRF check) unless a test is about the check itself.
 */
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import type { Express } from 'express';
import { createApp, type AppDeps } from '../../server/app';
import { createDb, type Db } from '../../server/db/client';
import { createMailer } from '../../server/lib/mail';
import { startMailCapture, type MailCapture } from '../../server/lib/mail-capture';
import { createLogger } from '../../server/lib/logger';
import { startLocalS3, type LocalS3 } from '../../server/lib/local-s3';
import { createStorage, type Storage } from '../../server/lib/storage';
import { seedDemoFiles } from '../../server/db/seed/demo-files';
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
  /** The object store the app uses (a local s3rver in a temp folder). */
  storage: Storage;
  close(): Promise<void>;
}

/** A local fake S3 (s3rver) in a fresh temp folder, with its bucket, for one test file; close() removes the folder. */
export async function startTestStorage(): Promise<{ s3: LocalS3; storage: Storage; close(): Promise<void> }> {
  const directory = await fs.mkdtemp(path.join(os.tmpdir(), 'fringewalk-s3-'));
  const s3 = await startLocalS3({ directory, bucket: 'fringewalk-test' });
  const storage = createStorage(s3.storageOptions);
  return {
    s3,
    storage,
    async close() {
      storage.close();
      await s3.close();
      await fs.rm(directory, { recursive: true, force: true });
    },
  };
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
  const files = await startTestStorage();
  if (options.seed) await seedDemoFiles(db, files.storage);
  const capture = await startMailCapture();
  const mailer = createMailer({ smtpUrl: capture.url, from: 'Fringewalk test <no-reply@fringewalk.invalid>' });
  const { app, close } = createApp({
    db,
    pool,
    logger: testLogger(),
    mailer,
    mailCapture: capture,
    storage: files.storage,
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
    storage: files.storage,
    async close() {
      await close();
      mailer.close();
      await capture.close();
      await files.close();
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
