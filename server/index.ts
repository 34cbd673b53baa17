/**
 * The process entry behind `npm start` and `npm run dev`: configuration, the database (a project-local
 * PostgreSQL unless DATABASE_URL is set), migrations, the demo seed on an empty database, mail (the
 * local capture unless SMTP_URL is set), the client (built, or Vite's dev middleware), createApp,
 * listen — and a graceful shutdown on Ctrl-C / SIGTERM that stops everything it started, in reverse.
 */
import http from 'node:http';
import net from 'node:net';
import path from 'node:path';
import { createApp } from './app';
import { createDb } from './db/client';
import { startLocalPostgres } from './db/local-postgres';
import { runMigrations } from './db/migrate';
import { seedDemo } from './db/seed/demo';
import { seedDemoFiles } from './db/seed/demo-files';
import { startEmcFlagJob } from './features/emc/emc-flag-job';
import { startCalibrationReminders } from './features/instruments/calibration-reminders';
import { buildClient, createViteDevMiddleware } from './lib/client-build';
import { ConfigError, LOCAL_DATABASE_NAME, loadConfig, resolveSessionSecret, type Config } from './lib/config';
import { createLogger } from './lib/logger';
import { createMailer } from './lib/mail';
import { startMailCapture, type MailCapture } from './lib/mail-capture';
import { startLocalS3 } from './lib/local-s3';
import { createStorage, type StorageOptions } from './lib/storage';

export type RunMode = 'start' | 'dev';

/** Connections still open this long after Ctrl-C are cut. */
const SHUTDOWN_GRACE_MS = 5_000;
export const DEMO_PASSWORD_NOTE = 'password "fringewalk-demo" (demo data only, never for real use)';

const say = (message: string) => console.log(`[fringewalk] ${message}`);

function describeStartupError(error: unknown, config: Config | null): string {
  if (error instanceof ConfigError) return error.message;
  if (error instanceof Error && error.name === 'PostgresSetupError') return error.message;
  // Drizzle wraps driver errors ("Failed query: …"); the cause carries the code.
  let code: string | undefined;
  for (let current: unknown = error, depth = 0; current && depth < 4 && !code; depth += 1) {
    const candidate = (current as { code?: unknown }).code;
    if (typeof candidate === 'string') code = candidate;
    current = (current as { cause?: unknown }).cause;
  }
  if (code === 'EADDRINUSE' && config) {
    return `Port ${config.port} on ${config.host} is already in use: stop the other server or set PORT to a free port.`;
  }
  if ((code === 'ECONNREFUSED' || code === 'ENOTFOUND' || code === 'ETIMEDOUT') && config?.databaseUrl) {
    return 'The PostgreSQL server named in DATABASE_URL cannot be reached: check that it is running and the URL is right.';
  }
  if (code === '28P01' || code === '28000') return 'PostgreSQL refused the user or password in DATABASE_URL.';
  if (code === '3D000') return 'The database named in DATABASE_URL does not exist: create it first.';
  const message = error instanceof Error ? error.message : String(error);
  return `Fringewalk could not start: ${message}`;
}

function assertPortFree(port: number, host: string): Promise<void> {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.once('error', reject);
    probe.listen(port, host, () => probe.close(() => resolve()));
  });
}

export async function runServer(mode: RunMode): Promise<void> {
  const stack: { name: string; stop: () => Promise<void> | void }[] = [];
  let config: Config | null = null;
  let stopping: Promise<void> | null = null;

  async function stopAll(): Promise<void> {
    while (stack.length > 0) {
      const step = stack.pop()!;
      try {
        await step.stop();
      } catch (error) {
        console.error(`[fringewalk] Stopping ${step.name} failed: ${error instanceof Error ? error.message : String(error)}`);
      }
    }
  }

  const shutdown = (signal: string) => {
    if (stopping) {
      say(`${signal} again: exiting now.`);
      process.exit(1);
    }
    say(`${signal} received: shutting down…`);
    stopping = stopAll().then(() => {
      say('Stopped.');
      process.exit(0);
    });
  };
  process.on('SIGINT', () => shutdown('SIGINT'));
  process.on('SIGTERM', () => shutdown('SIGTERM'));

  try {
    config = loadConfig();
    const logger = createLogger(config.logLevel);
    // Fail before the slow steps (database, build) if the port is taken.
    await assertPortFree(config.port, config.host);

    let databaseUrl = config.databaseUrl;
    if (databaseUrl) {
      say('Using the PostgreSQL server in DATABASE_URL.');
    } else {
      say(`Starting the project's PostgreSQL on 127.0.0.1:${config.localPgPort}…`);
      const local = await startLocalPostgres({
        dataDir: path.join(config.dataDir, 'pg'),
        port: config.localPgPort,
        database: LOCAL_DATABASE_NAME,
        log: say,
      });
      stack.push({ name: 'PostgreSQL', stop: () => local.stop() });
      databaseUrl = local.url;
    }

    await runMigrations(databaseUrl);
    say('Database migrated.');
    const { pool, db } = createDb(databaseUrl, { onIdleError: (error) => logger.warn({ err: error }, 'idle PostgreSQL connection failed') });
    stack.push({ name: 'the database pool', stop: () => pool.end() });

    const { rows } = await pool.query<{ count: number }>('SELECT count(*)::int AS count FROM organisations');
    if ((rows[0]?.count ?? 0) === 0) {
      say('Empty database: loading the demo data…');
      await seedDemo(db);
    }

    let storageOptions: StorageOptions;
    if (config.s3.endpoint) {
      say(`Using the object store at ${config.s3.endpoint} (bucket ${config.s3.bucket}).`);
      storageOptions = {
        endpoint: config.s3.endpoint,
        bucket: config.s3.bucket,
        region: config.s3.region,
        accessKeyId: config.s3.accessKeyId!,
        secretAccessKey: config.s3.secretAccessKey!,
      };
    } else {
      const localS3 = await startLocalS3({ directory: path.join(config.dataDir, 's3'), bucket: config.s3.bucket, port: config.s3.localPort });
      stack.push({ name: 'the local object store', stop: () => localS3.close() });
      say(`Started the local object store (fake S3) on ${localS3.endpoint}, files in ${path.join(config.dataDir, 's3')}.`);
      storageOptions = localS3.storageOptions;
    }
    const storage = createStorage(storageOptions);
    stack.push({ name: 'the object-store client', stop: () => storage.close() });
    if (!config.s3.endpoint) await storage.ensureBucket();
    const demoFiles = await seedDemoFiles(db, storage);
    if (demoFiles.length > 0) say(`Put ${demoFiles.length} demo file(s) (plan images, spectrum traces) into the object store.`);

    let capture: MailCapture | null = null;
    let smtpUrl = config.smtpUrl;
    if (!smtpUrl) {
      capture = await startMailCapture({ port: config.smtpCapturePort });
      const started = capture;
      stack.push({ name: 'the mail capture', stop: () => started.close() });
      smtpUrl = capture.url;
    }
    const mailer = createMailer({ smtpUrl, from: config.mailFrom });
    stack.push({ name: 'the mailer', stop: () => mailer.close() });

    const sessionSecret = resolveSessionSecret(config);
    const server = http.createServer();
    stack.push({
      name: 'the HTTP server',
      stop: () =>
        new Promise<void>((resolve) => {
          const force = setTimeout(() => server.closeAllConnections(), SHUTDOWN_GRACE_MS);
          force.unref();
          server.close(() => {
            clearTimeout(force);
            resolve();
          });
          server.closeIdleConnections();
        }),
    });

    let client: { dir: string } | { middleware: http.RequestListener & import('express').RequestHandler };
    if (mode === 'dev') {
      const vite = await createViteDevMiddleware(server);
      stack.push({ name: 'Vite', stop: () => vite.close() });
      client = { middleware: vite.middlewares as unknown as http.RequestListener & import('express').RequestHandler };
    } else {
      client = { dir: await buildClient(say) };
    }

    const { app, close } = createApp({
      db,
      pool,
      logger,
      mailer,
      mailCapture: capture,
      storage,
      publicUrl: config.publicUrl,
      trustedOrigins: config.trustedOrigins,
      sessionSecret,
      trustProxy: config.trustProxy,
      client,
    });
    stack.push({ name: 'the app', stop: close });
    const reminders = startCalibrationReminders({ db, storage, mailer, publicUrl: config.publicUrl, logger });
    stack.push({ name: 'the calibration reminders', stop: () => reminders.stop() });
    const emcFlags = startEmcFlagJob({ db, mailer, publicUrl: config.publicUrl, logger });
    stack.push({ name: 'the EMC flag job', stop: () => emcFlags.stop() });
    server.on('request', app);

    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(config!.port, config!.host, () => {
        server.off('error', reject);
        resolve();
      });
    });

    const lines = [
      '',
      `Fringewalk is running${mode === 'dev' ? ' (dev, with Vite)' : ''}: ${config.publicUrl}`,
      capture ? `E-mail goes to the local capture (smtp://127.0.0.1:${capture.port}); admins read it at ${config.publicUrl}/dev/mail` : 'E-mail goes to SMTP_URL.',
      `Demo accounts, ${DEMO_PASSWORD_NOTE}:`,
      '  admin@harrowby.example     (admin)',
      '  reviewer@harrowby.example  (reviewer)',
      '  emc@harrowby.example       (EMC engineer)',
      '  surveyor@harrowby.example  (surveyor)',
      '  viewer@harrowby.example    (viewer)',
      '  admin@kestrel.example      (admin of a second organisation)',
      'Press Ctrl-C to stop (PostgreSQL stops too).',
      '',
    ];
    console.log(lines.join('\n'));
  } catch (error) {
    console.error(`[fringewalk] ${describeStartupError(error, config)}`);
    if (process.env.FRINGEWALK_DEBUG) console.error(error);
    await stopAll();
    process.exit(1);
  }
}
