/**
 * The real Fringewalk app in a process of its own, for tests and benchmarks that must kill or measure
 * the server (tests/server/sync-faults.test.ts, tests/bench/sync.bench.ts). Run with
 * `node --import tsx tests/setup/sync-server-child.ts` and the environment:
 *   DATABASE_URL (required), SESSION_SECRET (required), PUBLIC_URL (the Origin clients send), PORT (0).
 * Prints one line `{"port": N}` on stdout once listening. With an IPC channel, it also answers
 * { type: 'memory-reset' } and { type: 'memory-report' } with its peak RSS and heap since the last reset
 * (sampled every 5 ms from the reset to the report), so a benchmark can see the server's own memory.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { createApp } from '../../server/app';
import { createDb } from '../../server/db/client';
import { createLogger } from '../../server/lib/logger';
import { createMailer } from '../../server/lib/mail';

const databaseUrl = process.env.DATABASE_URL;
const sessionSecret = process.env.SESSION_SECRET;
if (!databaseUrl || !sessionSecret) {
  console.error('sync-server-child: DATABASE_URL and SESSION_SECRET are required');
  process.exit(2);
}
const publicUrl = process.env.PUBLIC_URL ?? 'http://127.0.0.1:5180';

const { pool, db } = createDb(databaseUrl, { onIdleError: () => {} });
// Nothing in sync sends mail; a port nobody listens on keeps the mailer inert.
const mailer = createMailer({ smtpUrl: 'smtp://127.0.0.1:9', from: 'Fringewalk test <no-reply@fringewalk.invalid>' });
const { app, close } = createApp({
  db,
  pool,
  logger: createLogger(process.env.LOG_LEVEL ?? 'silent'),
  mailer,
  publicUrl,
  trustedOrigins: [publicUrl],
  sessionSecret,
});
const server = http.createServer(app);
server.listen(Number(process.env.PORT ?? 0), '127.0.0.1', () => {
  console.log(JSON.stringify({ port: (server.address() as AddressInfo).port }));
});

let peak = { rss: 0, heapUsed: 0 };
const sample = () => {
  const m = process.memoryUsage();
  peak = { rss: Math.max(peak.rss, m.rss), heapUsed: Math.max(peak.heapUsed, m.heapUsed) };
};
if (process.send) {
  // Sampling runs only from a reset to its report: at every 5 ms it costs the server CPU that the
  // benchmark's other figures (the push) would otherwise pay for.
  let sampler: NodeJS.Timeout | null = null;
  process.on('message', (message: { type?: string }) => {
    if (message?.type === 'memory-reset') {
      peak = { rss: 0, heapUsed: 0 };
      sample();
      sampler ??= setInterval(sample, 5).unref();
      process.send!({ type: 'memory-reset', ...process.memoryUsage() });
    }
    if (message?.type === 'memory-report') {
      sample();
      if (sampler) clearInterval(sampler);
      sampler = null;
      process.send!({ type: 'memory-report', peakRss: peak.rss, peakHeapUsed: peak.heapUsed, ...process.memoryUsage() });
    }
  });
  process.on('disconnect', () => process.exit(0));
}

process.on('SIGTERM', () => {
  server.close();
  server.closeAllConnections();
  void close()
    .then(() => pool.end())
    .finally(() => process.exit(0));
});
