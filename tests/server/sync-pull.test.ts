/**
 * Pull (issue 5 §1, §5): what each role sees, paging by the server's change sequence while writes go on,
 * and a connection dropped in the middle of a page.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PullResponseSchema, PushResponseSchema, type PullChange } from '../../shared/schemas/sync';
import type { Mutation } from '../../shared/sync/mutation';
import { seedDemo } from '../../server/db/seed/demo';
import { demoEmail, expectError, KESTREL_ADMIN, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { edited, makeReading, makeStation, mutationFor, readDemoIds, type DemoIds, type Scope } from '../setup/sync-fixtures';
import { createTestApp, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
let surveyor: SignedIn;
let surveyor2: SignedIn;
let reviewer: SignedIn;
let scope: Scope;

async function push(mutations: Mutation[]) {
  const res = await surveyor.agent.post(`/api/orgs/${ids.orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ deviceId: 'pull-test', mutations });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  const results = PushResponseSchema.parse(res.body).results;
  expect(results.every((r) => r.status === 'applied'), JSON.stringify(results)).toBe(true);
  return results;
}

async function page(who: SignedIn, since: string, limit: number, orgId = ids.orgId) {
  const res = await who.agent.get(`/api/orgs/${orgId}/sync/pull`).query({ since, limit });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return PullResponseSchema.parse(res.body);
}

async function pullAll(who: SignedIn, since = '0', limit = 5000, orgId = ids.orgId) {
  const changes: PullChange[] = [];
  let cursor = since;
  for (;;) {
    const p = await page(who, cursor, limit, orgId);
    changes.push(...(p.changes as PullChange[]));
    cursor = p.nextCursor;
    if (!p.hasMore) return { changes, cursor };
  }
}

/** Writes a row of an organisation-wide table with the next change sequence, as the owning features do. */
async function bumpWatchBand(name: string) {
  await sql(
    t.databaseUrl,
    `WITH seq AS (UPDATE organisations SET change_seq = change_seq + 1 WHERE id = $1 RETURNING change_seq)
     UPDATE watch_bands SET notes = $2, revision = revision + 1, change_seq = (SELECT change_seq FROM seq)
     WHERE id = (SELECT id FROM watch_bands WHERE organisation_id = $1 ORDER BY name LIMIT 1)`,
    [ids.orgId, name],
  );
}

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo });
  ids = await readDemoIds(t.databaseUrl);
  surveyor = await signIn(t.app, demoEmail('surveyor'));
  surveyor2 = await signIn(t.app, 'surveyor2@harrowby.example');
  reviewer = await signIn(t.app, demoEmail('reviewer'));
  scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor };
});
afterAll(async () => {
  await t?.close();
});

describe('pull', () => {
  it('gives a surveyor their surveys (every surveyor’s records, decisions, tombstones) and the organisation’s bands and zone sets', async () => {
    const station = makeStation(scope);
    const reading = makeReading(scope, station.id);
    await push([mutationFor('stations', station), mutationFor('field_readings', reading), mutationFor('field_readings', edited(reading, { deleted: true }))]);

    const mine = (await pullAll(surveyor)).changes;
    const entities = new Set(mine.map((c) => c.entity));
    for (const e of ['surveys', 'survey_assignments', 'walks', 'stations', 'field_readings', 'decisions', 'watch_bands', 'zone_sets']) expect(entities, e).toContain(e);
    const surveysSeen = new Set(mine.filter((c) => 'surveyId' in c.record).map((c) => c.record.surveyId));
    const assigned = await sql<{ survey_id: string }>(t.databaseUrl, `SELECT DISTINCT survey_id FROM survey_assignments WHERE user_id = $1 AND NOT deleted`, [ids.users.surveyor]);
    expect([...surveysSeen].sort()).toEqual(assigned.map((a) => a.survey_id).sort());
    expect(mine.find((c) => c.record.id === reading.id)?.record).toMatchObject({ deleted: true, revision: 2 });
    const remeasure = mine.find((c) => c.entity === 'decisions' && c.record.verdict === 'remeasure');
    expect(remeasure?.record.surveyId).toBe(ids.openSurveyId);
    // Other surveyors' readings of the same survey: the 2025 survey had two surveyors.
    const authors = new Set(mine.filter((c) => c.entity === 'field_readings' && c.record.surveyId === ids.signedOffSurveyId).map((c) => c.record.surveyorUserId));
    expect(authors).toEqual(new Set([ids.users.surveyor, ids.users.surveyor2]));

    // surveyor2 is not assigned to the open survey: none of it, not even the reading just pushed.
    const theirs = (await pullAll(surveyor2)).changes;
    expect(theirs.some((c) => c.record.surveyId === ids.openSurveyId || c.record.id === ids.openSurveyId)).toBe(false);
    expect(theirs.some((c) => c.entity === 'watch_bands')).toBe(true);

    // A reviewer sees the whole organisation, and every change once.
    const all = (await pullAll(reviewer)).changes;
    expect(all.find((c) => c.record.id === reading.id)).toBeDefined();
    expect(new Set(all.map((c) => c.seq)).size).toBe(all.length);
    const [{ n }] = (await sql<{ n: string }>(
      t.databaseUrl,
      `SELECT (SELECT count(*) FROM surveys WHERE organisation_id = $1) + (SELECT count(*) FROM survey_assignments WHERE organisation_id = $1)
            + (SELECT count(*) FROM walks WHERE organisation_id = $1) + (SELECT count(*) FROM stations WHERE organisation_id = $1)
            + (SELECT count(*) FROM field_readings WHERE organisation_id = $1) + (SELECT count(*) FROM sweeps WHERE organisation_id = $1)
            + (SELECT count(*) FROM decisions WHERE organisation_id = $1) + (SELECT count(*) FROM flags WHERE organisation_id = $1)
            + (SELECT count(*) FROM watch_bands WHERE organisation_id = $1) + (SELECT count(*) FROM zone_sets WHERE organisation_id = $1) AS n`,
      [ids.orgId],
    )) as [{ n: string }, ...unknown[]];
    expect(all.length).toBe(Number(n));
  });

  it('never shows another organisation’s changes', async () => {
    const kestrel = await signIn(t.app, KESTREL_ADMIN);
    const kestrelOrg = kestrel.session.memberships[0]!.organisationId;
    const theirs = (await pullAll(kestrel, '0', 5000, kestrelOrg)).changes;
    expect(theirs.every((c) => c.record.organisationId === kestrelOrg)).toBe(true);
    expectError(await kestrel.agent.get(`/api/orgs/${ids.orgId}/sync/pull`), 404, 'NOT_FOUND');
  });

  it('returns every change exactly once across pages while pushes continue', async () => {
    const start = (await pullAll(reviewer)).cursor;
    const stations = Array.from({ length: 5 }, (_, i) => makeStation(scope, { xM: 20 + i * 3 }));
    await push(stations.map((s) => mutationFor('stations', s)));
    const written = new Map<string, number>(); // reading id → expected final revision
    const edits: Mutation[][] = [];

    const writer = (async () => {
      for (let batch = 0; batch < 12; batch += 1) {
        const readings = Array.from({ length: 20 }, (_, i) => makeReading(scope, stations[i % 5]!.id, { magnitudeT: (batch * 20 + i + 1) * 1e-6 }));
        const mutations = readings.map((r) => mutationFor('field_readings', r));
        // Every third batch also edits some readings of an earlier batch: they move to new sequences.
        if (edits.length > 0 && batch % 3 === 0) mutations.push(...edits.shift()!);
        await push(mutations);
        for (const r of readings) written.set(r.id, 1);
        edits.push(readings.slice(0, 4).map((r) => mutationFor('field_readings', edited(r, { notes: `second look ${batch}` }))));
        for (const r of readings.slice(0, 4)) written.set(`${r.id}:edit`, 2);
        await new Promise((resolve) => setTimeout(resolve, 5));
      }
    })();

    const seen: PullChange[] = [];
    let cursor = start;
    let pages = 0;
    let writing = true;
    void writer.finally(() => (writing = false));
    while (writing || pages === 0) {
      const p = await page(reviewer, cursor, 15);
      seen.push(...(p.changes as PullChange[]));
      cursor = p.nextCursor;
      pages += 1;
      await new Promise((resolve) => setTimeout(resolve, 2));
    }
    await writer;
    const rest = await pullAll(reviewer, cursor, 15);
    seen.push(...rest.changes);
    expect(pages).toBeGreaterThan(3);

    // Strictly increasing: no change delivered twice, none out of order.
    for (let i = 1; i < seen.length; i += 1) expect(seen[i]!.seq).toBeGreaterThan(seen[i - 1]!.seq);
    // Every record's last delivery is its current state on the server: nothing skipped.
    const last = new Map<string, PullChange>();
    for (const c of seen) last.set(`${c.entity}:${c.record.id}`, c);
    const rows = await sql<{ id: string; revision: number; change_seq: string }>(t.databaseUrl, `SELECT id, revision, change_seq FROM field_readings WHERE survey_id = $1 AND change_seq > $2`, [ids.openSurveyId, start]);
    expect(rows.length).toBe(12 * 20);
    for (const row of rows) {
      const got = last.get(`field_readings:${row.id}`);
      expect(got, row.id).toBeDefined();
      expect(got!.seq).toBe(Number(row.change_seq));
      expect(got!.record.revision).toBe(row.revision);
    }
    const readingChanges = seen.filter((c) => c.entity === 'field_readings');
    const perRecord = new Map<string, number>();
    for (const c of readingChanges) perRecord.set(c.record.id as string, (perRecord.get(c.record.id as string) ?? 0) + 1);
    // A reading never edited arrives once; an edited one at most twice (before and after its edit).
    for (const [id, n] of perRecord) expect(n, id).toBeLessThanOrEqual(written.has(`${id}:edit`) ? 2 : 1);
  });

  it('carries changed watch bands to surveyors', async () => {
    const { cursor } = await pullAll(surveyor);
    await bumpWatchBand('re-checked against the 2020 Radio Regulations');
    // (Flags from the repeat recomputation of the pushes above may arrive too.)
    const changes = (await pullAll(surveyor, cursor)).changes.filter((c) => c.entity !== 'flags');
    expect(changes).toHaveLength(1);
    expect(changes[0]).toMatchObject({ entity: 'watch_bands', record: { notes: 're-checked against the 2020 Radio Regulations' } });
  });

  it('after a connection dropped in the middle of a page, the next pull from the cursor has no gap', async () => {
    const server = http.createServer(t.app);
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    const port = (server.address() as AddressInfo).port;
    try {
      const expected = await page(reviewer, '0', 5000);
      expect(expected.changes.length).toBeGreaterThan(500);
      // Start the same page and cut the connection after the first bytes.
      const received = await new Promise<number>((resolve, reject) => {
        const req = http.get({ host: '127.0.0.1', port, path: `/api/orgs/${ids.orgId}/sync/pull?since=0&limit=5000`, headers: { Cookie: reviewer.cookie } }, (res) => {
          let bytes = 0;
          res.on('data', (chunk: Buffer) => {
            bytes += chunk.length;
            req.destroy();
            resolve(bytes);
          });
          res.on('error', () => undefined);
        });
        req.on('error', (e) => (e.message.includes('aborted') || e.message.includes('socket hang up') ? undefined : reject(e)));
      });
      expect(received).toBeGreaterThan(0);
      expect(received).toBeLessThan(Buffer.byteLength(JSON.stringify(expected)));
      // The device kept its cursor ("0"): pulling again gives the whole page, nothing missing (and, since
      // writes go on — the repeat recomputation raises flags after pushes — perhaps more).
      const again = await page(reviewer, '0', 5000);
      const againSeqs = new Set(again.changes.map((c) => c.seq));
      expect(expected.changes.filter((c) => !againSeqs.has(c.seq))).toEqual([]);
    } finally {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
    }
  });

  it('refuses a cursor or limit that is not one', async () => {
    expectError(await reviewer.agent.get(`/api/orgs/${ids.orgId}/sync/pull`).query({ since: 'yesterday' }), 400, 'VALIDATION_FAILED');
    expectError(await reviewer.agent.get(`/api/orgs/${ids.orgId}/sync/pull`).query({ limit: 0 }), 400, 'VALIDATION_FAILED');
    expectError(await reviewer.agent.get(`/api/orgs/${ids.orgId}/sync/pull`).query({ limit: 5001 }), 400, 'VALIDATION_FAILED');
  });
});
