/**
 * The real Fringewalk server for the client sync tests, composed so that faults can be made for real:
 * - the HTTP server can be stopped and started again on the same port with the same database (a server
 *   that goes away between two pull pages);
 * - the device reaches it through a TCP relay on loopback that can cut one upload after N bytes of its
 *   body (a connection dropped halfway through a photo).
 * The browser window (happy-dom) lives at the relay's origin; the app trusts that origin and
 * TRUSTED_ORIGIN, so supertest agents can play other people (a second surveyor, a reviewer) in-process.
 */
import http from 'node:http';
import net from 'node:net';
import type { Express } from 'express';
import { createApp } from '../../server/app';
import { createDb, type Db } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed/demo';
import { seedDemoFiles } from '../../server/db/seed/demo-files';
import { createMailer } from '../../server/lib/mail';
import { startMailCapture } from '../../server/lib/mail-capture';
import type { Storage } from '../../server/lib/storage';
import { startTestStorage, TEST_SESSION_SECRET, testLogger, TRUSTED_ORIGIN } from '../setup/test-app';
import { createTestDatabase } from '../setup/test-db';

export interface SyncServer {
  /** The origin the device uses (the relay). */
  baseUrl: string;
  app: Express;
  db: Db;
  databaseUrl: string;
  storage: Storage;
  /** Stop answering: every open connection is closed, new ones are refused. */
  stop(): Promise<void>;
  /** Listen again on the same port. */
  start(): Promise<void>;
  /** Cut the next request whose first line matches `line` after `bytes` bytes of its body; resolves when cut. */
  cutNextUpload(line: RegExp, bytes: number): Promise<{ bodyBytesPassed: number }>;
  /** First lines of the HTTP requests that went through the relay, in order. */
  requestLines: string[];
  close(): Promise<void>;
}

const listen = (server: net.Server, port = 0) =>
  new Promise<number>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve((server.address() as net.AddressInfo).port));
  });

export async function startSyncServer(): Promise<SyncServer> {
  const database = await createTestDatabase();
  const { pool, db } = createDb(database.url, { onIdleError: () => {} });
  await seedDemo(db);
  const files = await startTestStorage();
  await seedDemoFiles(db, files.storage);
  const capture = await startMailCapture();
  const mailer = createMailer({ smtpUrl: capture.url, from: 'Fringewalk test <no-reply@fringewalk.invalid>' });

  // The relay first, so the app can trust its origin.
  let appPort = 0;
  const requestLines: string[] = [];
  let cut: { line: RegExp; bytes: number; resolve: (v: { bodyBytesPassed: number }) => void } | null = null;
  const relaySockets = new Set<net.Socket>();
  const relay = net.createServer((client) => {
    relaySockets.add(client);
    const upstream = net.connect(appPort, '127.0.0.1');
    relaySockets.add(upstream);
    const end = () => {
      client.destroy();
      upstream.destroy();
      relaySockets.delete(client);
      relaySockets.delete(upstream);
    };
    upstream.on('error', end).on('close', end);
    client.on('error', end).on('close', end);
    upstream.on('data', (chunk) => client.write(chunk));
    // Client → server: note request lines; when armed, pass only `bytes` of the matching request's body.
    let armed: { remaining: number; passed: number; resolve: (v: { bodyBytesPassed: number }) => void } | null = null;
    client.on('data', (chunk: Buffer) => {
      if (armed) return forwardArmed(chunk);
      const text = chunk.toString('latin1');
      const firstLine = /^[A-Z]+ \S+ HTTP\/1\.[01]/.exec(text)?.[0];
      if (firstLine) requestLines.push(firstLine);
      if (firstLine && cut && cut.line.test(firstLine)) {
        const headEnd = text.indexOf('\r\n\r\n');
        armed = { remaining: cut.bytes, passed: 0, resolve: cut.resolve };
        cut = null;
        upstream.write(chunk.subarray(0, headEnd + 4));
        return forwardArmed(chunk.subarray(headEnd + 4));
      }
      upstream.write(chunk);
    });
    function forwardArmed(chunk: Buffer) {
      const a = armed!;
      if (a.remaining <= 0) return;
      const take = Math.min(a.remaining, chunk.length);
      if (take > 0) upstream.write(chunk.subarray(0, take));
      a.remaining -= take;
      a.passed += take;
      if (a.remaining === 0) {
        // Let the bytes reach the server, then drop both ends as a dead link would.
        setTimeout(() => {
          end();
          a.resolve({ bodyBytesPassed: a.passed });
        }, 50);
      }
    }
  });
  const relayPort = await listen(relay);
  const baseUrl = `http://127.0.0.1:${relayPort}`;

  const { app, close: closeApp } = createApp({
    db,
    pool,
    logger: testLogger(),
    mailer,
    mailCapture: capture,
    storage: files.storage,
    publicUrl: baseUrl,
    trustedOrigins: [baseUrl, TRUSTED_ORIGIN],
    sessionSecret: TEST_SESSION_SECRET,
  });
  let server = http.createServer(app);
  appPort = await listen(server);
  let running = true;

  const stop = async () => {
    if (!running) return;
    running = false;
    await new Promise<void>((resolve) => {
      server.close(() => resolve());
      server.closeAllConnections();
    });
  };
  const start = async () => {
    if (running) return;
    server = http.createServer(app);
    await listen(server, appPort);
    running = true;
  };

  return {
    baseUrl,
    app,
    db,
    databaseUrl: database.url,
    storage: files.storage,
    stop,
    start,
    requestLines,
    cutNextUpload: (line, bytes) => new Promise((resolve) => (cut = { line, bytes, resolve })),
    async close() {
      for (const s of relaySockets) s.destroy();
      await new Promise<void>((resolve) => relay.close(() => resolve()));
      await stop();
      await closeApp();
      mailer.close();
      await capture.close();
      await files.close();
      await pool.end();
      await database.drop();
    },
  };
}
