/**
 * What the browser benchmarks share: a production build of the client in a throwaway folder, and the
 * real server on loopback over a throwaway PostgreSQL cluster with the demo seed (and, when asked, a
 * local fake S3 holding the demo's files). Everything started is torn down by the caller's cleanups, in
 * reverse order.
 */
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'vite';
import type { BenchRow } from './harness';
import { createApp } from '../../server/app';
import { createDb } from '../../server/db/client';
import { freePort, makeThrowawayDir, startLocalPostgres } from '../../server/db/local-postgres';
import { runMigrations } from '../../server/db/migrate';
import { seedDemo } from '../../server/db/seed/demo';
import { seedDemoFiles } from '../../server/db/seed/demo-files';
import { startLocalS3 } from '../../server/lib/local-s3';
import { createLogger } from '../../server/lib/logger';
import { createMailer } from '../../server/lib/mail';
import { createStorage, type Storage } from '../../server/lib/storage';

export type Cleanups = Array<() => Promise<void> | void>;

const root = fileURLToPath(new URL('../..', import.meta.url));

/** Debian's Chromium, headless, with nothing of its own running in the background. */
export const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

/**
 * Runs a browser benchmark's main: cleans up afterwards, on failure and on Ctrl-C or a timeout (so no
 * browser, cluster or temp folder is left behind), and with --strict exits non-zero when a goal is missed.
 */
export function runBrowserBench(main: () => Promise<BenchRow[]>, cleanups: Cleanups): void {
  const cleanup = () => runCleanups(cleanups);
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      void cleanup().finally(() => process.exit(130));
    });
  }
  main()
    .then(async (rows) => {
      await cleanup();
      if (process.argv.includes('--strict') && rows.some((r) => !r.pass)) process.exit(1);
    })
    .catch(async (error: unknown) => {
      console.error(error);
      await cleanup();
      process.exit(1);
    });
}

/** Runs the cleanups last-in first-out, carrying on past a failing one. */
export async function runCleanups(cleanups: Cleanups): Promise<void> {
  for (const step of cleanups.reverse()) {
    try {
      await step();
    } catch {
      // keep tearing down the rest
    }
  }
}

/** `npm run build` into a throwaway folder (unminified with BENCH_PROFILE set, for readable profiles). */
export async function buildBenchClient(cleanups: Cleanups): Promise<string> {
  const outDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringewalk-bench-client-'));
  cleanups.push(() => fs.rmSync(outDir, { recursive: true, force: true }));
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({ root, configFile: path.join(root, 'vite.config.ts'), mode: 'production', logLevel: 'error', build: { outDir, emptyOutDir: true, sourcemap: false, ...(process.env.BENCH_PROFILE ? { minify: false } : {}) } });
  } finally {
    process.env.NODE_ENV = nodeEnv;
  }
  return outDir;
}

/** The server with the demo seed, serving `clientDir`; `files` adds the object store with the demo's plans and traces. */
export async function startBenchServer(clientDir: string, cleanups: Cleanups, options: { files: boolean }): Promise<{ baseUrl: string; databaseUrl: string }> {
  const dataDir = makeThrowawayDir('fringewalk-bench-pg-');
  const pgServer = await startLocalPostgres({ dataDir, port: await freePort(), database: 'fringewalk_bench', throwaway: true });
  cleanups.push(async () => {
    await pgServer.stop();
    fs.rmSync(dataDir, { recursive: true, force: true });
  });
  await runMigrations(pgServer.url);
  const { pool, db } = createDb(pgServer.url, { onIdleError: () => {} });
  cleanups.push(() => pool.end());
  await seedDemo(db);
  let storage: Storage | undefined;
  if (options.files) {
    const s3Dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringewalk-bench-s3-'));
    const s3 = await startLocalS3({ directory: s3Dir, bucket: 'fringewalk-bench' });
    const store = createStorage(s3.storageOptions);
    storage = store;
    cleanups.push(async () => {
      store.close();
      await s3.close();
      fs.rmSync(s3Dir, { recursive: true, force: true });
    });
    await seedDemoFiles(db, store);
  }
  const server = http.createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  cleanups.push(
    () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  );
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  // Nothing here sends mail; the mailer points at a closed port.
  const mailer = createMailer({ smtpUrl: 'smtp://127.0.0.1:9', from: 'bench <no-reply@fringewalk.invalid>' });
  cleanups.push(() => mailer.close());
  const { app, close } = createApp({
    db,
    pool,
    logger: createLogger('silent'),
    mailer,
    ...(storage ? { storage } : {}),
    publicUrl: baseUrl,
    trustedOrigins: [baseUrl],
    sessionSecret: 'bench-session-secret-that-is-long-enough-0123456789',
    client: { dir: clientDir },
  });
  cleanups.push(close);
  server.on('request', app);
  return { baseUrl, databaseUrl: pgServer.url };
}
