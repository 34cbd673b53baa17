/**
 * Faults (issue 5, Tests): the server process killed (SIGKILL, a real child process) in the middle of a
 * large push, restarted, and the same batch retried: every reading on the server exactly once.
 *
 * To kill it truly mid-request, the test holds the organisation's change-sequence row lock from its own
 * connection — the lock every writer takes late in its transaction (server/db/audit.ts) — so the push is
 * caught inside its transaction, after claiming its mutations and locking its records, waiting for
 * sequences. pg_stat_activity shows it waiting; then the process is killed.
 */
import http from 'node:http';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PushResponseSchema } from '../../shared/schemas/sync';
import { createDb } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed/demo';
import { countRows, DEMO_PASSWORD, sql } from '../setup/api-helpers';
import { CHILD_ORIGIN, postJson, signInOver, startChildServer, type ChildServer } from '../setup/sync-child';
import { makeReading, makeStation, mutationFor, readDemoIds, type DemoIds, type Scope } from '../setup/sync-fixtures';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';

let database: TestDatabase;
let ids: DemoIds;
let scope: Scope;
const children: ChildServer[] = [];

beforeAll(async () => {
  database = await createTestDatabase();
  const { pool, db } = createDb(database.url);
  await seedDemo(db);
  await pool.end();
  ids = await readDemoIds(database.url);
  scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor };
});
afterAll(async () => {
  for (const c of children) await c.stop();
  await database?.drop();
});

async function waitFor(check: () => Promise<boolean>, what: string, timeoutMs = 15_000) {
  const until = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

/** Backends of this database other than `exceptPid`, inside a transaction. */
async function otherTransactions(exceptPid: number) {
  return sql<{ pid: number; wait_event_type: string | null; query: string }>(
    database.url,
    `SELECT pid, wait_event_type, query FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid() AND pid <> $1 AND xact_start IS NOT NULL`,
    [exceptPid],
  );
}

describe('faults', () => {
  it('when the server is killed in the middle of a large push and restarted, the retried batch lands every reading exactly once', async () => {
    let server = await startChildServer(database.url);
    children.push(server);
    const cookie = await signInOver(server.baseUrl, 'surveyor@harrowby.example', DEMO_PASSWORD);

    const stations = Array.from({ length: 10 }, (_, i) => makeStation(scope, { xM: 100 + i, yM: 100 }));
    const first = await postJson(server.baseUrl, cookie, `/api/orgs/${ids.orgId}/sync/push`, { deviceId: 'fault-device', mutations: stations.map((s) => mutationFor('stations', s)) });
    expect(first.status).toBe(200);
    const readings = Array.from({ length: 490 }, (_, i) => makeReading(scope, stations[i % 10]!.id, { magnitudeT: (i + 1) * 1e-6 }));
    const batch = { deviceId: 'fault-device', mutations: readings.map((r) => mutationFor('field_readings', r)) };
    const readingIds = readings.map((r) => `'${r.id}'`).join(',');

    // Hold the counter row lock.
    const blocker = new pg.Client({ connectionString: database.url });
    await blocker.connect();
    const [{ pid: blockerPid }] = (await blocker.query<{ pid: number }>('SELECT pg_backend_pid() AS pid')).rows as [{ pid: number }];
    await blocker.query('BEGIN');
    await blocker.query('SELECT change_seq FROM organisations WHERE id = $1 FOR UPDATE', [ids.orgId]);

    const body = JSON.stringify(batch);
    const outcome = new Promise<string>((resolve) => {
      const url = new URL(`${server.baseUrl}/api/orgs/${ids.orgId}/sync/push`);
      const req = http.request({ host: url.hostname, port: url.port, path: url.pathname, method: 'POST', headers: { 'Content-Type': 'application/json', 'Content-Length': Buffer.byteLength(body), Origin: CHILD_ORIGIN, Cookie: cookie } });
      req.on('response', (res) => resolve(`answered ${res.statusCode}`));
      req.on('error', (e) => resolve(`failed: ${e.message}`));
      req.end(body);
    });
    await waitFor(async () => (await otherTransactions(blockerPid)).some((b) => b.wait_event_type === 'Lock'), 'the push to wait on the sequence lock');
    // The push's transaction has claimed its mutations and locked its records: kill the server now.
    server.child.kill('SIGKILL');
    await server.exited;
    expect(await outcome).toMatch(/^failed: (socket hang up|read ECONNRESET|other side closed)/);
    await blocker.query('ROLLBACK');
    await blocker.end();
    // PostgreSQL rolls the orphaned transaction back when it finds the client gone.
    await waitFor(async () => (await otherTransactions(-1)).length === 0, 'the killed server’s transaction to end');
    expect(await countRows(database.url, 'field_readings', `id IN (${readingIds})`)).toBe(0);
    expect(await countRows(database.url, 'sync_mutations', `mutation_id IN (${batch.mutations.map((m) => `'${m.mutationId}'`).join(',')})`)).toBe(0);

    // Restart; the session lives in PostgreSQL, so the device's cookie still works. Retry the same batch.
    server = await startChildServer(database.url);
    children.push(server);
    const retried = await postJson(server.baseUrl, cookie, `/api/orgs/${ids.orgId}/sync/push`, batch);
    expect(retried.status, JSON.stringify(retried.body)).toBe(200);
    const results = PushResponseSchema.parse(retried.body).results;
    expect(results.every((r) => r.status === 'applied')).toBe(true);
    // And once more, as a device does when the answer to its retry is lost too.
    const again = await postJson(server.baseUrl, cookie, `/api/orgs/${ids.orgId}/sync/push`, batch);
    expect(PushResponseSchema.parse(again.body).results).toEqual(results);

    expect(await countRows(database.url, 'field_readings', `id IN (${readingIds})`)).toBe(490);
    expect(await countRows(database.url, 'change_log', `entity_id IN (${readingIds})`)).toBe(490);
    const revisions = await sql<{ revision: number; n: number }>(database.url, `SELECT revision, count(*)::int AS n FROM field_readings WHERE id IN (${readingIds}) GROUP BY revision`);
    expect(revisions).toEqual([{ revision: 1, n: 490 }]);
  });
});
