/**
 * The device's sync engine (src/sync) against the REAL server (in-process, its own PostgreSQL database
 * with the demo seed, the real object store fake), through the app's own api client, with real Dexie
 * stores over fake-indexeddb standing for devices. Other people (a second surveyor, a reviewer) act
 * through the server's HTTP API with supertest. Faults are real: a server that stops between pull
 * pages, and an upload whose TCP connection is cut halfway.
 */
import { createHash } from 'node:crypto';
import sharp from 'sharp';
import request from 'supertest';
import { v7 as uuidv7 } from 'uuid';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { SessionSchema } from '@shared/schemas/auth';
import { FieldReadingSchema, type FieldReading } from '@shared/schemas/capture';
import { ConflictListSchema, PushResponseSchema } from '@shared/schemas/sync';
import { db, FringewalkDb, type OutboxRow } from '@/db';
import { apiRequest } from '@/lib/api';
import { getRemeasureRequests, saveFieldReading, saveStation, startWalk, takeSurveyOffline } from '@/features/capture/data';
import {
  backoffCeilingMs,
  createSyncEngine,
  createSyncScheduler,
  downloadAttachment,
  getRecordSyncState,
  progressText,
  pullChanges,
  readCursor,
  resendRejected,
  type SyncProgress,
} from '@/sync';
import { createSynced } from '../../server/db/synced-write';
import { decisions } from '../../server/db/schema';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-data';
import { sql } from '../setup/api-helpers';
import { makeReading, makeStation, makeWalk, mutationFor, readDemoIds, type DemoIds } from '../setup/sync-fixtures';
import { TRUSTED_ORIGIN } from '../setup/test-app';
import { closedPortUrl, pointWindowAt } from './helpers';
import { startSyncServer, type SyncServer } from './sync-harness';

let server: SyncServer;
let ids: DemoIds;
let orgId: string;
let surveyId: string;
let userId: string;
const devices: FringewalkDb[] = [];

/** A second device of the same surveyor: its own store. */
async function device(name: string): Promise<FringewalkDb> {
  const d = new FringewalkDb(`fringewalk-${name}-${uuidv7()}`);
  await d.open();
  devices.push(d);
  return d;
}

async function agentFor(email: string) {
  const agent = request.agent(server.app);
  const res = await agent.post('/api/auth/sign-in').set('Origin', TRUSTED_ORIGIN).send({ email, password: DEMO_PASSWORD });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return agent;
}

/** Log a station and `n` readings on the app's device store through the capture feature's own functions. */
async function logReadings(n: number, over: Partial<FieldReading> = {}) {
  const walk = await startWalk({ surveyId, orgId, userId });
  const station = await saveStation({
    organisationId: orgId, surveyId, levelId: ids.levelId, walkId: walk.id, roomId: null, label: null, xM: 5 + Math.random() * 10, yM: 7, heightM: 1, createdByUserId: userId, notes: null,
  });
  const readings: FieldReading[] = [];
  for (let i = 0; i < n; i++) {
    readings.push(
      await saveFieldReading({
        organisationId: orgId, surveyId, stationId: station.id, walkId: walk.id, instrumentId: null, surveyorUserId: userId,
        magnitudeT: (i + 1) * 1e-4, bxT: null, byT: null, bzT: null, unit: 'mT', probeOrientation: 'vertical', heightM: 1,
        backgroundT: null, zeroed: true, measuredAt: new Date(Date.UTC(2026, 10, 18, 9, 0, i)).toISOString(), notes: null,
        photoObjectKey: null, photoSha256: null, ...over,
      }),
    );
  }
  return { walk, station, readings };
}

/** Edit a reading on another device's store the way the capture feature does: record and outbox entry in one transaction. */
async function editOn(store: FringewalkDb, readingId: string, changes: Partial<FieldReading>) {
  await store.transaction('rw', store.fieldReadings, store.outbox, async () => {
    const previous = (await store.fieldReadings.get(readingId))!;
    const next = FieldReadingSchema.parse({ ...previous, ...changes, revision: previous.revision + 1 });
    await store.fieldReadings.put({ ...next, fieldT: next.magnitudeT ?? 0 });
    const entry: OutboxRow = {
      mutationId: uuidv7(), entity: 'field_readings', recordId: readingId, surveyId: next.surveyId, baseRevision: previous.revision,
      payload: next as unknown as Record<string, unknown>, queuedAt: new Date().toISOString(), status: 'pending', error: null,
    };
    await store.outbox.add(entry);
  });
}

async function serverRow(table: string, id: string) {
  return (await sql<{ revision: number; magnitude_t: number | null; deleted: boolean }>(server.databaseUrl, `SELECT * FROM ${table} WHERE id = $1`, [id]))[0];
}

beforeAll(async () => {
  server = await startSyncServer();
  ids = await readDemoIds(server.databaseUrl);
  orgId = ids.orgId;
  surveyId = ids.openSurveyId;
  userId = ids.users.surveyor;
  // The seed assigns only the first surveyor to the open survey; the reviewer adds the second, as the app does.
  const reviewer = await agentFor('reviewer@harrowby.example');
  const team = await reviewer
    .put(`/api/orgs/${orgId}/surveys/${surveyId}/assignments`)
    .set('Origin', TRUSTED_ORIGIN)
    .send({ surveyors: [ids.users.surveyor, ids.users.surveyor2], reviewers: [ids.users.reviewer] });
  expect(team.status, JSON.stringify(team.body)).toBe(200);
  pointWindowAt(server.baseUrl);
  await apiRequest('/api/auth/sign-in', { method: 'POST', body: { email: 'surveyor@harrowby.example', password: DEMO_PASSWORD }, schema: SessionSchema });
});
afterAll(async () => {
  for (const d of devices) {
    d.close();
    await d.delete();
  }
  db.close();
  await server?.close();
});
beforeEach(async () => {
  pointWindowAt(server.baseUrl);
  for (const d of devices.splice(0)) {
    d.close();
    await d.delete();
  }
  await db.delete();
  await db.open();
  await takeSurveyOffline({ orgId, surveyId });
});

/** Resolves once the organisation's change counter has not moved for two seconds (no write in flight). */
async function waitForQuietServer() {
  const counter = async () => (await sql<{ change_seq: string }>(server.databaseUrl, `SELECT change_seq::text FROM organisations WHERE id = $1`, [orgId]))[0]!.change_seq;
  let last = await counter();
  for (let quietSince = Date.now(); Date.now() - quietSince < 2_000; ) {
    await new Promise((r) => setTimeout(r, 250));
    const now = await counter();
    if (now !== last) {
      last = now;
      quietSince = Date.now();
    }
  }
}

describe('push', () => {
  it('drains N outbox entries in batches, marks every record synced with the server’s revision, and reports "pushing k of n"', async () => {
    const { readings, station } = await logReadings(45);
    // 1 walk + 1 station + 45 readings, then 5 of them corrected: 52 queued changes.
    for (const r of readings.slice(0, 5)) await saveFieldReading({ ...r, notes: 'probe re-zeroed' });
    expect(await db.outbox.count()).toBe(52);

    const progress: SyncProgress[] = [];
    const engine = createSyncEngine({ db, orgId, batchSize: 10, onProgress: (p) => progress.push(p) });
    const result = await engine.run();

    expect(result.status).toBe('done');
    if (result.status !== 'done') return;
    expect(result.push).toMatchObject({ sent: 52, applied: 52, conflicts: 0, rejected: 0, waiting: 0 });
    expect(await db.outbox.count()).toBe(0);
    const pushing = progress.filter((p) => p.phase === 'pushing');
    // One step per batch of 10 (two may be on the way at once, so the last two can finish in either order).
    const steps = pushing.map((p) => p.done);
    expect(steps.slice(0, 5)).toEqual([0, 10, 20, 30, 40]);
    expect(steps.slice(5)).toEqual(expect.arrayContaining([52]));
    expect([[50, 52], [42, 52]]).toContainEqual(steps.slice(5));
    expect(pushing.every((p) => p.total === 52)).toBe(true);
    expect(progressText(pushing[2]!)).toBe('Pushing 20 of 52');
    expect(progress.at(-1)!.phase).toBe('pulling');
    expect(progressText({ phase: 'pulling', done: 0, total: null })).toBe('Pulling…');

    // Every record: on the server once, at the revision the device now holds.
    for (const r of readings) {
      const local = (await db.fieldReadings.get(r.id))!;
      const remote = await serverRow('field_readings', r.id);
      expect(remote, r.id).toBeDefined();
      expect(local.revision).toBe(remote!.revision);
      expect((await getRecordSyncState(db, 'field_readings', r.id)).state).toBe('synced');
    }
    expect((await serverRow('field_readings', readings[0]!.id))!.revision).toBe(2);
    expect((await serverRow('stations', station.id))!.revision).toBe(1);
    const [{ n }] = (await sql<{ n: number }>(server.databaseUrl, `SELECT count(*)::int AS n FROM field_readings WHERE station_id = $1`, [station.id])) as [{ n: number }];
    expect(n).toBe(45);
    expect((await db.syncState.get(orgId))!.lastSyncAt).toBe(result.finishedAt);
  });

  it('keeps two independent batches on the way at once, and holds back a batch that needs an earlier one’s station', async () => {
    // 1 walk + 1 station + 28 readings at it, in batches of 10: the first batch makes the station the
    // second's readings were taken at, so the second may set off only once the first is answered; the
    // third needs nothing of the second, so it goes while the second is on the way. Every push is watched on its way
    // to the real server, and its answer held back (up to 1.5 s) until another push sets off, so two
    // batches that may overlap do, and a batch that must wait is seen waiting.
    await logReadings(28);
    const realFetch = globalThis.fetch;
    const pushes: { index: number; ids: string[]; overlapped: number[] }[] = [];
    const onTheWay = new Set<number>();
    let arrived: (() => void) | null = null;
    globalThis.fetch = async (input, init) => {
      if (!String(input).includes('/sync/push')) return realFetch(input, init);
      const index = pushes.length;
      const ids = (JSON.parse(String(init?.body)) as { mutations: { recordId: string }[] }).mutations.map((m) => m.recordId);
      pushes.push({ index, ids, overlapped: [...onTheWay] });
      for (const other of onTheWay) pushes[other]!.overlapped.push(index);
      onTheWay.add(index);
      arrived?.();
      try {
        const response = await realFetch(input, init);
        await new Promise<void>((resolve) => {
          const timer = setTimeout(resolve, 1500);
          arrived = () => {
            clearTimeout(timer);
            resolve();
          };
        });
        return response;
      } finally {
        onTheWay.delete(index);
      }
    };
    try {
      const result = await createSyncEngine({ db, orgId, batchSize: 10 }).run();
      expect(result.status === 'done' && result.push).toMatchObject({ sent: 30, applied: 30, rejected: 0, waiting: 0 });
    } finally {
      globalThis.fetch = realFetch;
    }
    expect(pushes.map((p) => p.ids.length)).toEqual([10, 10, 10]);
    expect(pushes[0]!.overlapped).toEqual([]);
    expect(pushes[1]!.overlapped).toEqual([2]);
    expect(pushes[2]!.overlapped).toEqual([1]);
    expect(await db.outbox.count()).toBe(0);
  });

  it('keeps a refused change on the device with the server’s message, and sends it again once fixed', async () => {
    const unknownInstrument = uuidv7();
    const { readings } = await logReadings(2, { instrumentId: unknownInstrument });
    const bad = readings[0]!;
    expect((await getRecordSyncState(db, 'field_readings', bad.id)).state).toBe('local');

    const engine = createSyncEngine({ db, orgId });
    const first = await engine.run();
    expect(first.status === 'done' && first.push).toMatchObject({ applied: 2, rejected: 2 });
    const refused = await db.outbox.where('status').equals('rejected').toArray();
    expect(refused.map((r) => r.recordId).sort()).toEqual(readings.map((r) => r.id).sort());
    expect(refused[0]!.error).toMatch(/instrument/i);
    const state = await getRecordSyncState(db, 'field_readings', bad.id);
    expect(state.state).toBe('rejected');
    expect(state.message).toBe(refused.find((r) => r.recordId === bad.id)!.error);
    expect(await serverRow('field_readings', bad.id)).toBeUndefined();
    // A run without a fix sends nothing again: refused entries wait for the surveyor.
    const idle = await engine.run();
    expect(idle.status === 'done' && idle.push.sent).toBe(0);

    // The surveyor fixes one (picks no instrument) and saves: the new change supersedes the refused one.
    await saveFieldReading({ ...bad, instrumentId: ids.gaussmeterId });
    const fixed = await engine.run();
    expect(fixed.status === 'done' && fixed.push).toMatchObject({ sent: 1, applied: 1, rejected: 0 });
    expect((await serverRow('field_readings', bad.id))!.revision).toBe(1);
    expect((await db.fieldReadings.get(bad.id))!.revision).toBe(1);
    expect((await getRecordSyncState(db, 'field_readings', bad.id)).state).toBe('synced');

    // The other: "Send again" as it is, still refused, still kept.
    expect(await resendRejected(db, [readings[1]!.id])).toBe(1);
    const again = await engine.run();
    expect(again.status === 'done' && again.push).toMatchObject({ sent: 1, rejected: 1 });
    expect((await getRecordSyncState(db, 'field_readings', readings[1]!.id)).state).toBe('rejected');
  });

  it('sends a later change in a later batch on the revision the server gave the earlier one (no conflict with itself)', async () => {
    // A refused reading, fixed and then changed again: the server makes it at revision 1 although the
    // device had counted 2, so the queued change after it must be sent on revision 1, not 2.
    const { readings } = await logReadings(1, { instrumentId: uuidv7() });
    const reading = readings[0]!;
    const engine = createSyncEngine({ db, orgId, batchSize: 1 });
    const first = await engine.run();
    expect(first.status === 'done' && first.push).toMatchObject({ rejected: 1 });
    await saveFieldReading({ ...reading, instrumentId: ids.gaussmeterId });
    await saveFieldReading({ ...(await db.fieldReadings.get(reading.id))!, notes: 'second look, probe re-zeroed' });
    expect(await db.outbox.where('status').equals('pending').count()).toBe(2);

    const second = await engine.run();
    expect(second.status === 'done' && second.push).toMatchObject({ sent: 2, applied: 2, conflicts: 0, rejected: 0 });
    const remote = (await sql<{ revision: number; notes: string | null }>(server.databaseUrl, 'SELECT revision, notes FROM field_readings WHERE id = $1', [reading.id]))[0]!;
    expect(remote).toEqual({ revision: 2, notes: 'second look, probe re-zeroed' });
    expect((await db.fieldReadings.get(reading.id))!.revision).toBe(2);
    expect((await getRecordSyncState(db, 'field_readings', reading.id)).state).toBe('synced');
    expect(await sql(server.databaseUrl, 'SELECT id FROM sync_conflicts WHERE record_id = $1', [reading.id])).toEqual([]);
  });

  it('when two devices edit one reading, the device that lost marks a conflict and the server keeps both revisions', async () => {
    const { readings } = await logReadings(1);
    const reading = readings[0]!;
    await createSyncEngine({ db, orgId }).run();
    const tablet = await device('tablet');
    await createSyncEngine({ db: tablet, orgId }).run();
    expect((await tablet.fieldReadings.get(reading.id))!.revision).toBe(1);

    await saveFieldReading({ ...reading, magnitudeT: 7e-4, notes: 'phone: re-read after moving the trolley' });
    await editOn(tablet, reading.id, { magnitudeT: 9e-4, notes: 'tablet: re-read' });
    const tabletRun = await createSyncEngine({ db: tablet, orgId }).run();
    expect(tabletRun.status === 'done' && tabletRun.push.applied).toBe(1);
    const phoneRun = await createSyncEngine({ db, orgId }).run();
    expect(phoneRun.status === 'done' && phoneRun.push.conflicts).toBe(1);

    const mine = (await db.fieldReadings.get(reading.id))!;
    expect(mine.magnitudeT).toBe(7e-4);
    const mark = (await db.syncConflicts.get(['field_readings', reading.id]))!;
    expect(mark.origin).toBe('push');
    expect(mark.serverVersion).toMatchObject({ magnitudeT: 9e-4, revision: 2 });
    expect(mark.localVersion).toMatchObject({ magnitudeT: 7e-4 });
    expect((await getRecordSyncState(db, 'field_readings', reading.id)).state).toBe('conflict');
    expect((await getRecordSyncState(tablet, 'field_readings', reading.id)).state).toBe('synced');
    // The server: its record is the tablet's, and the conflict keeps the phone's beside it.
    expect((await serverRow('field_readings', reading.id))!.magnitude_t).toBe(9e-4);
    const reviewer = await agentFor('reviewer@harrowby.example');
    const res = await reviewer.get(`/api/orgs/${orgId}/sync/conflicts`).query({ surveyId });
    const conflict = ConflictListSchema.parse(res.body).conflicts.find((c) => c.recordId === reading.id)!;
    expect(conflict.id).toBe(mark.conflictId);
    expect(conflict.serverVersion).toMatchObject({ magnitudeT: 9e-4 });
    expect(conflict.incomingVersion).toMatchObject({ magnitudeT: 7e-4 });

    // The reviewer chooses the phone's; the next pull brings the outcome and clears the mark.
    const chosen = await reviewer.post(`/api/orgs/${orgId}/sync/conflicts/${conflict.id}/resolve`).set('Origin', TRUSTED_ORIGIN).send({ choose: 'incoming' });
    expect(chosen.status, JSON.stringify(chosen.body)).toBe(200);
    await createSyncEngine({ db, orgId }).run();
    await createSyncEngine({ db: tablet, orgId }).run();
    expect(await db.syncConflicts.get(['field_readings', reading.id])).toBeUndefined();
    expect((await tablet.fieldReadings.get(reading.id))!.magnitudeT).toBe(7e-4);
    expect((await getRecordSyncState(db, 'field_readings', reading.id)).state).toBe('synced');
  });
});

describe('pull', () => {
  it('brings another surveyor’s readings, their tombstones and a reviewer’s re-measure request', async () => {
    const bram = await agentFor('surveyor2@harrowby.example');
    const scope = { orgId, surveyId, levelId: ids.levelId, userId: ids.users.surveyor2 };
    const walk = makeWalk(scope, { deviceId: 'bram-phone' });
    const station = makeStation(scope, { walkId: walk.id, xM: 31 });
    const kept = makeReading(scope, station.id, { walkId: walk.id, magnitudeT: 2.5e-3 });
    const dropped = makeReading(scope, station.id, { walkId: walk.id, magnitudeT: 9.9e-3 });
    const res = await bram
      .post(`/api/orgs/${orgId}/sync/push`)
      .set('Origin', TRUSTED_ORIGIN)
      .send({ deviceId: 'bram-phone', mutations: [mutationFor('walks', walk), mutationFor('stations', station), mutationFor('field_readings', kept), mutationFor('field_readings', dropped), mutationFor('field_readings', { ...dropped, deleted: true, revision: 2 })] });
    expect(PushResponseSchema.parse(res.body).results.every((r) => r.status === 'applied')).toBe(true);
    await server.db.transaction((tx) =>
      createSynced(tx, decisions, 'decisions', orgId, { surveyId, fieldReadingId: kept.id, sweepId: null, verdict: 'remeasure', note: 'Re-read at 1.5 m, away from the trolley.', reviewerUserId: ids.users.reviewer }, { actorUserId: ids.users.reviewer }),
    );

    const result = await createSyncEngine({ db, orgId, pullLimit: 200 }).run();
    expect(result.status === 'done' && result.pull.pages).toBeGreaterThan(1);
    expect(await db.fieldReadings.get(kept.id)).toMatchObject({ surveyorUserId: ids.users.surveyor2, magnitudeT: 2.5e-3, fieldT: 2.5e-3, revision: 1 });
    expect(await db.fieldReadings.get(dropped.id)).toMatchObject({ deleted: true, revision: 2 });
    expect((await db.stations.get(station.id))!.latestFieldT).toBe(2.5e-3);
    const requests = await getRemeasureRequests(surveyId);
    expect(requests.get(station.id)?.map((d) => d.note)).toEqual(['Re-read at 1.5 m, away from the trolley.']);
    // The cursor is the server's last sequence: a second run pulls nothing new.
    const again = await createSyncEngine({ db, orgId }).run();
    expect(again.status === 'done' && again.pull.changes).toBe(0);
  });

  it('never overwrites an unsynced edit: a newer server revision is kept beside it as a conflict', async () => {
    const { readings } = await logReadings(2);
    await createSyncEngine({ db, orgId }).run();
    const [contested, quiet] = readings as [FieldReading, FieldReading];
    const tablet = await device('tablet');
    await createSyncEngine({ db: tablet, orgId }).run();
    await editOn(tablet, contested.id, { magnitudeT: 4.4e-3 });
    await createSyncEngine({ db: tablet, orgId }).run();

    await saveFieldReading({ ...contested, magnitudeT: 1.1e-3 });
    await saveFieldReading({ ...quiet, magnitudeT: 2.2e-3 });
    // Pull alone (as after a push that failed): both local edits stay as they are.
    await pullChanges({ db, orgId });
    expect((await db.fieldReadings.get(contested.id))!.magnitudeT).toBe(1.1e-3);
    expect((await db.fieldReadings.get(quiet.id))!.magnitudeT).toBe(2.2e-3);
    expect(await db.outbox.count()).toBe(2);
    // The server moved on under one of them: kept beside it. The other started from the server's revision: no conflict.
    const mark = (await db.syncConflicts.get(['field_readings', contested.id]))!;
    expect(mark).toMatchObject({ origin: 'pull', serverRevision: 2 });
    expect(mark.serverVersion).toMatchObject({ magnitudeT: 4.4e-3 });
    expect(await db.syncConflicts.get(['field_readings', quiet.id])).toBeUndefined();
    expect((await getRecordSyncState(db, 'field_readings', quiet.id)).state).toBe('local');
  });
});

describe('scheduling and faults', () => {
  it('backs off with jitter within bounds while the server is unreachable, and resets on success', async () => {
    await logReadings(1);
    const draws = [0, 0.999, 0.5, 0.25, 0.75, 0.1, 0.9];
    let i = 0;
    const backoff = { baseMs: 100, maxMs: 1_000, random: () => draws[i++ % draws.length]! };
    const scheduler = createSyncScheduler({ engine: createSyncEngine({ db, orgId }), intervalMs: 30_000, backoff });
    pointWindowAt(await closedPortUrl());
    const ceilings: number[] = [];
    for (let k = 1; k <= draws.length; k++) {
      expect(await scheduler.syncNow()).toBeNull();
      const s = scheduler.get();
      expect(s.failures).toBe(k);
      expect(s.lastError).toMatch(/reach the server/);
      const ceiling = backoffCeilingMs(k, backoff);
      ceilings.push(ceiling);
      // Equal jitter (Brooker, AWS Architecture Blog 2015): uniform in [ceiling/2, ceiling].
      expect(s.nextDelayMs).toBeGreaterThanOrEqual(ceiling / 2);
      expect(s.nextDelayMs).toBeLessThanOrEqual(ceiling);
      expect(s.nextDelayMs).toBe(Math.round(ceiling / 2 + draws[k - 1]! * (ceiling / 2)));
    }
    expect(ceilings).toEqual([100, 200, 400, 800, 1000, 1000, 1000]);
    expect(await db.outbox.count()).toBe(3);

    pointWindowAt(server.baseUrl);
    const ok = await scheduler.syncNow();
    expect(ok?.status).toBe('done');
    expect(scheduler.get()).toMatchObject({ failures: 0, lastError: null, nextDelayMs: 30_000 });
    expect(await db.outbox.count()).toBe(0);
  });

  it('lets one run at a time through: a second engine on the same store is told it is busy; a dead tab’s lease expires', async () => {
    await logReadings(30);
    const a = createSyncEngine({ db, orgId, lock: { mode: 'lease' } });
    const b = createSyncEngine({ db, orgId, lock: { mode: 'lease' } });
    const [ra, rb] = await Promise.all([a.run(), b.run()]);
    expect([ra.status, rb.status].sort()).toEqual(['busy', 'done']);
    const done = ra.status === 'done' ? ra : rb.status === 'done' ? rb : null;
    expect(done?.push.applied).toBe(32);
    expect(await db.outbox.count()).toBe(0);
    expect(await db.meta.get('syncLease')).toBeUndefined();

    // Another tab holds a live lease: busy. Its lease ran out (the tab died): the run goes ahead.
    await db.meta.put({ key: 'syncLease', value: { owner: 'other-tab', expiresAt: Date.now() + 60_000 } });
    expect((await a.run()).status).toBe('busy');
    await db.meta.put({ key: 'syncLease', value: { owner: 'other-tab', expiresAt: Date.now() - 1 } });
    expect((await a.run()).status).toBe('done');
  });

  it('when the server goes away between two pull pages, the next run resumes from the stored cursor with no gap', async () => {
    // Earlier tests' pushes leave repeat-group recomputations pending on the server (debounced, they
    // write flags a second or so later): let them land first, so both devices below see the same data.
    await waitForQuietServer();
    const phone = await device('phone');
    let stopped = false;
    const engine = createSyncEngine({
      db: phone,
      orgId,
      pullLimit: 40,
      onProgress: (p) => {
        if (p.phase === 'pulling' && p.done > 0 && !stopped) {
          stopped = true;
          void server.stop();
        }
      },
    });
    await expect(engine.run()).rejects.toThrow(/reach the server/);
    const cursor = await readCursor(phone, orgId);
    expect(cursor).toBeGreaterThan(0);
    const storedBefore = await phone.fieldReadings.count() + (await phone.stations.count()) + (await phone.surveys.count());
    expect(storedBefore).toBeGreaterThan(0);

    await server.start();
    const linesBefore = server.requestLines.length;
    const resumed = await engine.run();
    expect(resumed.status).toBe('done');
    const firstPull = server.requestLines.slice(linesBefore).find((l) => l.includes('/sync/pull'))!;
    expect(firstPull).toContain(`since=${cursor}&`);

    // The same as a device that pulled without a fault, record for record.
    const calm = await device('calm');
    await createSyncEngine({ db: calm, orgId, pullLimit: 40 }).run();
    const snapshot = async (d: FringewalkDb) => ({
      walks: (await d.walks.toArray()).map((r) => `${r.id}@${r.revision}`).sort(),
      stations: (await d.stations.toArray()).map((r) => `${r.id}@${r.revision}`).sort(),
      readings: (await d.fieldReadings.toArray()).map((r) => `${r.id}@${r.revision}:${r.deleted}`).sort(),
      sweeps: (await d.sweeps.toArray()).map((r) => `${r.id}@${r.revision}`).sort(),
      decisions: (await d.decisions.toArray()).map((r) => `${r.id}@${r.revision}:${r.stationId}`).sort(),
    });
    const [interrupted, straight] = [await snapshot(phone), await snapshot(calm)];
    expect(interrupted).toEqual(straight);
    expect(straight.readings.length).toBeGreaterThan(100);
    expect(await readCursor(phone, orgId)).toBe(await readCursor(calm, orgId));
  });

  it('an upload cut halfway completes on the next run with an intact file, which a second device then downloads', async () => {
    const photo = await sharp({ create: { width: 320, height: 240, channels: 3, background: { r: 128, g: 128, b: 128 }, noise: { type: 'gaussian', mean: 128, sigma: 40 } } }).png().toBuffer();
    expect(photo.length).toBeGreaterThan(100_000);
    const expected = createHash('sha256').update(photo).digest('hex');
    const { station } = await logReadings(0);
    const reading = await saveFieldReading(
      {
        organisationId: orgId, surveyId, stationId: station.id, walkId: null, instrumentId: null, surveyorUserId: userId, magnitudeT: 3e-3, bxT: null, byT: null, bzT: null,
        unit: 'mT', probeOrientation: 'vertical', heightM: 1, backgroundT: null, zeroed: true, measuredAt: '2026-11-18T10:00:00.000Z', notes: 'photo of the probe stand', photoObjectKey: null, photoSha256: null,
      },
      new Blob([new Uint8Array(photo)], { type: 'image/png' }),
    );
    expect(reading.photoSha256).toBe(expected);

    const cut = server.cutNextUpload(/^PUT \/api\/orgs\/[^/]+\/attachments\//, Math.floor(photo.length / 2));
    const engine = createSyncEngine({ db, orgId });
    await expect(engine.run()).rejects.toThrow();
    expect((await cut).bodyBytesPassed).toBe(Math.floor(photo.length / 2));
    // The record arrived, the file did not: nothing half-written on the server, and the device still holds it.
    expect((await serverRow('field_readings', reading.id))!.revision).toBe(1);
    expect(await sql(server.databaseUrl, `SELECT 1 FROM attachments WHERE record_id = $1`, [reading.id])).toHaveLength(0);
    const local = (await db.attachments.where('recordId').equals(reading.id).first())!;
    expect(local.uploadedAt).toBeNull();
    expect(local.uploadAttempts).toBe(1);

    const second = await engine.run();
    expect(second.status === 'done' && second.uploads).toMatchObject({ uploaded: 1, failed: 0 });
    const [row] = await sql<{ object_key: string; sha256: string; bytes: string }>(server.databaseUrl, `SELECT object_key, sha256, bytes FROM attachments WHERE record_id = $1`, [reading.id]);
    expect(row).toMatchObject({ sha256: expected, bytes: String(photo.length) });
    const object = (await server.storage.getObject(row!.object_key))!;
    const hash = createHash('sha256');
    for await (const chunk of object.body as AsyncIterable<Buffer>) hash.update(chunk);
    expect(hash.digest('hex')).toBe(expected);
    expect((await db.attachments.get(local.id))!.objectKey).toBe(row!.object_key);

    // Another device learns of the photo with the record and downloads it on demand, checked by hash.
    const tablet = await device('tablet');
    await createSyncEngine({ db: tablet, orgId }).run();
    expect(await tablet.remoteFiles.get([reading.id, 'photo'])).toMatchObject({ sha256: expected, arrived: true });
    const downloaded = await downloadAttachment(tablet, orgId, reading.id, 'photo');
    expect(createHash('sha256').update(Buffer.from(downloaded.data)).digest('hex')).toBe(expected);
    expect(await tablet.remoteFiles.get([reading.id, 'photo'])).toBeUndefined();
  });
});
