/**
 * The real Fringewalk server for a test file: its own database (cloned from the migrated template),
 * optionally the demo seed, a local SMTP capture that nodemailer delivers to, and the app itself on
 * 127.0.0.1 at a free port. Call inside a Vitest test file (createTestDatabase uses inject()),
 * typically in beforeAll, and close() in afterAll: it stops everything and drops the database.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { createApp, type AppDeps } from '../../server/app';
import { startEmcFlagJob } from '../../server/features/emc/emc-flag-job';
import { createDb } from '../../server/db/client';
import { createMailer } from '../../server/lib/mail';
import { startMailCapture, type CapturedMail } from '../../server/lib/mail-capture';
import { seedDemoFiles } from '../../server/db/seed/demo-files';
import type { Storage } from '../../server/lib/storage';
import { startTestStorage, TEST_SESSION_SECRET, testLogger } from './test-app';
import { createTestDatabase } from './test-db';

export type { CapturedMail };

export interface TestApp {
  baseUrl: string;
  databaseUrl: string;
  /** The object store the app uses (a local s3rver in a temp folder). */
  storage: Storage;
  mail: {
    list(): Promise<CapturedMail[]>;
    waitFor(predicate: (m: CapturedMail) => boolean, timeoutMs?: number): Promise<CapturedMail>;
  };
  close(): Promise<void>;
}

export interface StartTestAppOptions {
  seed?: 'demo' | 'none';
  /** A built client folder (dist/) to serve with the SPA fallback. */
  clientDir?: string;
  /** Overrides for the sign-in / reset rate limits (tests that sign in many times). */
  rateLimits?: AppDeps['rateLimits'];
}

export async function startTestApp(options: StartTestAppOptions = {}): Promise<TestApp> {
  const database = await createTestDatabase();
  const cleanups: (() => Promise<void> | void)[] = [() => database.drop()];
  let closed = false;
  const cleanup = async () => {
    if (closed) return;
    closed = true;
    for (const step of cleanups.reverse()) {
      try {
        await step();
      } catch {
        // keep tearing down the rest
      }
    }
  };
  try {
    const { pool, db } = createDb(database.url, { onIdleError: () => {} });
    cleanups.push(() => pool.end());
    if (options.seed === 'demo') {
      const { seedDemo } = await import('../../server/db/seed/demo');
      await seedDemo(db);
    }

    const files = await startTestStorage();
    cleanups.push(() => files.close());
    if (options.seed === 'demo') await seedDemoFiles(db, files.storage);

    const capture = await startMailCapture();
    cleanups.push(() => capture.close());
    const mailer = createMailer({ smtpUrl: capture.url, from: 'Fringewalk test <no-reply@fringewalk.invalid>' });
    cleanups.push(() => mailer.close());

    // Listen first, so the app knows its own origin (links in e-mails, the CSRF check).
    const server = http.createServer();
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(0, '127.0.0.1', () => resolve());
    });
    cleanups.push(
      () =>
        new Promise<void>((resolve) => {
          server.close(() => resolve());
          server.closeAllConnections();
        }),
    );
    const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

    const { app, close } = createApp({
      db,
      pool,
      logger: testLogger(),
      mailer,
      mailCapture: capture,
      storage: files.storage,
      publicUrl: baseUrl,
      trustedOrigins: [baseUrl],
      sessionSecret: TEST_SESSION_SECRET,
      rateLimits: options.rateLimits,
      ...(options.clientDir ? { client: { dir: options.clientDir } } : {}),
    });
    cleanups.push(close);
    // As in npm start: the EMC flag job keeps the demo survey's line-in-band flags current.
    const emcJob = startEmcFlagJob({ db, mailer, publicUrl: baseUrl, logger: testLogger(), intervalMs: 1_000 });
    cleanups.push(() => emcJob.stop());
    server.on('request', app);

    return {
      baseUrl,
      databaseUrl: database.url,
      storage: files.storage,
      mail: {
        list: async () => capture.list(),
        waitFor: (predicate, timeoutMs) => capture.waitFor(predicate, timeoutMs),
      },
      close: cleanup,
    };
  } catch (error) {
    await cleanup();
    throw error;
  }
}
