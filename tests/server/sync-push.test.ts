/**
 * Push (issue 5 §1, §5): idempotent retries, per-mutation answers, out-of-order batches, permissions,
 * and the server's own ordering. Real app, real PostgreSQL (a database of this file's own).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { v7 as uuidv7 } from 'uuid';
import { PushResponseSchema, type PushResult } from '../../shared/schemas/sync';
import type { Mutation } from '../../shared/sync/mutation';
import { seedDemo } from '../../server/db/seed/demo';
import { countRows, demoEmail, expectError, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { edited, makeReading, makeStation, makeSweep, makeWalk, mutationFor, readDemoIds, type DemoIds, type Scope } from '../setup/sync-fixtures';
import { createTestApp, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
let surveyor: SignedIn;
let surveyor2: SignedIn;
let viewer: SignedIn;
let kestrelAdmin: SignedIn;
let scope: Scope;

async function push(who: SignedIn, mutations: Mutation[], deviceId = 'test-device-a', orgId = ids.orgId) {
  return who.agent.post(`/api/orgs/${orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ deviceId, mutations });
}
async function pushOk(who: SignedIn, mutations: Mutation[], deviceId?: string): Promise<PushResult[]> {
  const res = await push(who, mutations, deviceId);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return PushResponseSchema.parse(res.body).results;
}

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo });
  ids = await readDemoIds(t.databaseUrl);
  surveyor = await signIn(t.app, demoEmail('surveyor'));
  surveyor2 = await signIn(t.app, 'surveyor2@harrowby.example');
  viewer = await signIn(t.app, demoEmail('viewer'));
  kestrelAdmin = await signIn(t.app, 'admin@kestrel.example');
  scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor };
});
afterAll(async () => {
  await t?.close();
});

describe('push', () => {
  it('when the same batch is pushed twice, it is applied once and answered the same', async () => {
    const walk = makeWalk(scope);
    const station = makeStation(scope, { walkId: walk.id });
    const readings = [1, 2, 3].map((n) => makeReading(scope, station.id, { walkId: walk.id, magnitudeT: n * 1e-4 }));
    const batch = [mutationFor('walks', walk), mutationFor('stations', station), ...readings.map((r) => mutationFor('field_readings', r))];
    const seqBefore = (await sql<{ change_seq: string }>(t.databaseUrl, 'SELECT change_seq FROM organisations WHERE id = $1', [ids.orgId]))[0]!.change_seq;

    const first = await pushOk(surveyor, batch);
    expect(first.map((r) => r.status)).toEqual(['applied', 'applied', 'applied', 'applied', 'applied']);
    const seqs = first.map((r) => (r.status === 'applied' ? r.changeSeq : 0));
    expect([...seqs].sort((a, b) => a - b)).toEqual(seqs); // assigned in batch order
    expect(first.every((r) => r.status === 'applied' && r.revision === 1)).toBe(true);

    const second = await pushOk(surveyor, batch);
    expect(second).toEqual(first);
    const readingIds = readings.map((r) => `'${r.id}'`).join(',');
    expect(await countRows(t.databaseUrl, 'field_readings', `id IN (${readingIds})`)).toBe(3);
    expect(await countRows(t.databaseUrl, 'change_log', `entity_id IN (${readingIds})`)).toBe(3);
    const seqAfter = (await sql<{ change_seq: string }>(t.databaseUrl, 'SELECT change_seq FROM organisations WHERE id = $1', [ids.orgId]))[0]!.change_seq;
    expect(Number(seqAfter) - Number(seqBefore)).toBe(5); // the retry took no sequence
    const [row] = await sql<{ revision: number; field_t: number }>(t.databaseUrl, 'SELECT revision, field_t FROM field_readings WHERE id = $1', [readings[1]!.id]);
    expect(row).toEqual({ revision: 1, field_t: 2e-4 });
  });

  it('when retries of a batch race the first attempt, it is applied once and every attempt gets the same answers', async () => {
    const station = makeStation(scope);
    await pushOk(surveyor, [mutationFor('stations', station)]);
    const moved = edited(station, { notes: 'moved to the door frame' });
    const readings = Array.from({ length: 200 }, (_, n) => makeReading(scope, station.id, { magnitudeT: (n + 1) * 1e-5 }));
    const batch = [mutationFor('stations', moved, 1), ...readings.map((r) => mutationFor('field_readings', r))];
    const seqBefore = Number((await sql<{ change_seq: string }>(t.databaseUrl, 'SELECT change_seq FROM organisations WHERE id = $1', [ids.orgId]))[0]!.change_seq);

    // Three attempts at once: one applies, the others wait for it and are answered from what it stored.
    const attempts = await Promise.all([1, 2, 3].map(() => pushOk(surveyor, batch)));
    expect(attempts[0]!.every((r) => r.status === 'applied')).toBe(true);
    expect(attempts[1]).toEqual(attempts[0]);
    expect(attempts[2]).toEqual(attempts[0]);
    const readingIds = readings.map((r) => `'${r.id}'`).join(',');
    expect(await countRows(t.databaseUrl, 'field_readings', `id IN (${readingIds})`)).toBe(200);
    expect(await countRows(t.databaseUrl, 'change_log', `entity_id IN (${readingIds}, '${station.id}')`)).toBe(202); // the station: created, then moved once
    expect(await countRows(t.databaseUrl, 'sync_mutations', `mutation_id IN (${batch.map((m) => `'${m.mutationId}'`).join(',')})`)).toBe(201);
    expect(await countRows(t.databaseUrl, 'sync_conflicts', `record_id = '${station.id}'`)).toBe(0);
    const [row] = await sql<{ revision: number; notes: string }>(t.databaseUrl, 'SELECT revision, notes FROM stations WHERE id = $1', [station.id]);
    expect(row).toEqual({ revision: 2, notes: 'moved to the door frame' });
    const seqAfter = Number((await sql<{ change_seq: string }>(t.databaseUrl, 'SELECT change_seq FROM organisations WHERE id = $1', [ids.orgId]))[0]!.change_seq);
    expect(seqAfter - seqBefore).toBe(201);
  });

  it('takes one change sequence per change, none for rejected or answered mutations', async () => {
    const orgSeq = async () => Number((await sql<{ change_seq: string }>(t.databaseUrl, 'SELECT change_seq FROM organisations WHERE id = $1', [ids.orgId]))[0]!.change_seq);
    const station = makeStation(scope);
    const good = mutationFor('stations', station);
    const orphan = mutationFor('field_readings', makeReading(scope, uuidv7())); // its station is not on the server
    const malformed = { ...mutationFor('stations', makeStation(scope)), baseRevision: -1 };
    const before = await orgSeq();
    const results = await pushOk(surveyor, [good, orphan, malformed]);
    expect(results.map((r) => (r.status === 'rejected' ? r.error.code : r.status))).toEqual(['applied', 'STATION_UNKNOWN', 'VALIDATION_FAILED']);
    expect(results[0]!.status === 'applied' && results[0]!.changeSeq).toBe(before + 1);
    expect(await orgSeq()).toBe(before + 1);
    // Only rejections, then only answered mutations: the counter does not move.
    expect((await pushOk(surveyor, [orphan, malformed])).every((r) => r.status === 'rejected')).toBe(true);
    expect(await pushOk(surveyor, [good])).toEqual([results[0]]);
    expect(await orgSeq()).toBe(before + 1);
    // The next change follows without a gap.
    const [next] = await pushOk(surveyor, [mutationFor('stations', makeStation(scope))]);
    expect(next!.status === 'applied' && next!.changeSeq).toBe(before + 2);
  });

  it('applies a create and two edits of one record in one batch as revisions 1, 2, 3', async () => {
    const station = makeStation(scope);
    const r1 = makeReading(scope, station.id);
    const r2 = edited(r1, { notes: 'probe re-zeroed' });
    const r3 = edited(r2, { deleted: true });
    const results = await pushOk(surveyor, [mutationFor('stations', station), mutationFor('field_readings', r1), mutationFor('field_readings', r2), mutationFor('field_readings', r3)]);
    expect(results.map((r) => (r.status === 'applied' ? r.revision : r.status))).toEqual([1, 1, 2, 3]);
    const [row] = await sql<{ revision: number; deleted: boolean; notes: string; change_seq: string }>(t.databaseUrl, 'SELECT revision, deleted, notes, change_seq FROM field_readings WHERE id = $1', [r1.id]);
    expect(row).toMatchObject({ revision: 3, deleted: true, notes: 'probe re-zeroed' });
    expect(Number(row!.change_seq)).toBe(results[3]!.status === 'applied' ? results[3]!.changeSeq : -1);
    expect(await countRows(t.databaseUrl, 'change_log', `entity_id = '${r1.id}'`)).toBe(3);
  });

  it('rejects a reading whose station comes in a later batch with STATION_UNKNOWN, and applies it when retried after the station', async () => {
    const station = makeStation(scope);
    const reading = makeReading(scope, station.id);
    const readingMutation = mutationFor('field_readings', reading);
    const [early] = await pushOk(surveyor, [readingMutation]);
    expect(early).toMatchObject({ status: 'rejected', error: { code: 'STATION_UNKNOWN' } });
    expect(await countRows(t.databaseUrl, 'field_readings', `id = '${reading.id}'`)).toBe(0);
    // Rejections are not remembered: the same mutation id is evaluated anew once its station is there.
    await pushOk(surveyor, [mutationFor('stations', station)]);
    const [retried] = await pushOk(surveyor, [readingMutation]);
    expect(retried).toMatchObject({ status: 'applied', revision: 1 });
  });

  it('applies the valid mutations of a batch and rejects the invalid one with its message', async () => {
    const station = makeStation(scope);
    const good = makeReading(scope, station.id);
    const bad = makeReading(scope, station.id, { magnitudeT: null }); // neither |B| nor components
    const alsoGood = makeReading(scope, station.id, { magnitudeT: 2e-3 });
    const results = await pushOk(surveyor, [mutationFor('stations', station), mutationFor('field_readings', good), mutationFor('field_readings', bad), mutationFor('field_readings', alsoGood)]);
    expect(results.map((r) => r.status)).toEqual(['applied', 'applied', 'rejected', 'applied']);
    const rejected = results[2]!;
    expect(rejected.status === 'rejected' && rejected.error.code).toBe('VALIDATION_FAILED');
    expect(rejected.status === 'rejected' && rejected.error.message).toMatch(/Enter \|B\| or its three components/);
    expect(rejected.status === 'rejected' && rejected.error.details).toEqual({ issues: [{ path: 'payload.magnitudeT', message: 'Enter |B| or its three components.' }] });
    expect(await countRows(t.databaseUrl, 'field_readings', `id IN ('${good.id}', '${bad.id}', '${alsoGood.id}')`)).toBe(2);
    expect(await countRows(t.databaseUrl, 'sync_mutations', `record_id = '${bad.id}'`)).toBe(0);
  });

  it('rejects only the record a database constraint refuses, and applies the rest of the batch', async () => {
    // The wire schema does not compare a walk's times; the table's check does (walks_times_ck).
    const backwards = makeWalk(scope, { startedAt: '2026-11-18T10:00:00.000Z', endedAt: '2026-11-18T09:00:00.000Z' });
    const fine = makeWalk(scope);
    const station = makeStation(scope, { walkId: fine.id });
    const results = await pushOk(surveyor, [mutationFor('walks', backwards), mutationFor('walks', fine), mutationFor('stations', station)]);
    expect(results.map((r) => (r.status === 'rejected' ? r.error.code : r.status))).toEqual(['CONSTRAINT_FAILED', 'applied', 'applied']);
    expect(await countRows(t.databaseUrl, 'walks', `id IN ('${backwards.id}', '${fine.id}')`)).toBe(1);
    expect(await countRows(t.databaseUrl, 'sync_mutations', `record_id = '${backwards.id}'`)).toBe(0);
  });

  it('rejects a malformed mutation envelope and a payload that does not match its mutation', async () => {
    const station = makeStation(scope);
    const m = mutationFor('stations', station);
    const results = await pushOk(surveyor, [
      { ...m, mutationId: uuidv7(), entity: 'rooms' as never },
      { ...m, mutationId: uuidv7(), recordId: uuidv7() },
      m,
    ]);
    expect(results.map((r) => (r.status === 'rejected' ? r.error.code : r.status))).toEqual(['VALIDATION_FAILED', 'PAYLOAD_MISMATCH', 'applied']);
  });

  it('refuses the whole request when it is not a batch (no deviceId, too many mutations)', async () => {
    expectError(await surveyor.agent.post(`/api/orgs/${ids.orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ mutations: [] }), 400, 'VALIDATION_FAILED');
    const many = Array.from({ length: 501 }, () => mutationFor('stations', makeStation(scope)));
    expectError(await push(surveyor, many), 400, 'VALIDATION_FAILED');
  });

  it('refuses writes into a signed-off survey', async () => {
    const s = { ...scope, surveyId: ids.signedOffSurveyId };
    const [r] = await pushOk(surveyor, [mutationFor('stations', makeStation(s))]);
    expect(r).toMatchObject({ status: 'rejected', error: { code: 'SURVEY_NOT_OPEN', details: { state: 'signed_off' } } });
  });

  it('refuses a surveyor who is not assigned to the survey, and writes under another surveyor’s name', async () => {
    const s2 = { ...scope, userId: ids.users.surveyor2 };
    const [unassigned] = await pushOk(surveyor2, [mutationFor('stations', makeStation(s2))], 'test-device-b');
    expect(unassigned).toMatchObject({ status: 'rejected', error: { code: 'NOT_ASSIGNED' } });
    const station = makeStation(scope);
    const [, impostor] = await pushOk(surveyor, [mutationFor('stations', station), mutationFor('field_readings', makeReading(scope, station.id, { surveyorUserId: ids.users.reviewer }))]);
    expect(impostor).toMatchObject({ status: 'rejected', error: { code: 'NOT_OWNER' } });
  });

  it('refuses cross-organisation writes without telling what exists elsewhere', async () => {
    // Another organisation's member cannot reach this organisation's push at all.
    expectError(await push(kestrelAdmin, [mutationFor('stations', makeStation(scope))]), 404, 'NOT_FOUND');
    // A payload naming another organisation, a survey that is not here, a level of another organisation.
    const foreignOrg = makeStation({ ...scope, orgId: ids.kestrelOrgId });
    const missingSurvey = makeStation({ ...scope, surveyId: uuidv7() });
    const foreignLevel = makeStation({ ...scope, levelId: ids.kestrelLevelId });
    const results = await pushOk(surveyor, [mutationFor('stations', foreignOrg), mutationFor('stations', missingSurvey), mutationFor('stations', foreignLevel)]);
    expect(results.map((r) => (r.status === 'rejected' ? r.error.code : r.status))).toEqual(['PAYLOAD_MISMATCH', 'SURVEY_NOT_FOUND', 'REFERENCE_UNKNOWN']);
  });

  it('answers a record id taken in another organisation with RECORD_ID_UNAVAILABLE', async () => {
    // A station of the other organisation, written there directly (its own survey, its own counter).
    const [level] = await sql<{ id: string; site_id: string }>(t.databaseUrl, `SELECT id, site_id FROM levels WHERE organisation_id = $1 LIMIT 1`, [ids.kestrelOrgId]);
    const foreignId = uuidv7();
    const kSurveyId = uuidv7();
    await sql(
      t.databaseUrl,
      `WITH seq AS (UPDATE organisations SET change_seq = change_seq + 2 WHERE id = $1 RETURNING change_seq)
       INSERT INTO surveys (organisation_id, id, change_seq, site_id, name) SELECT $1, $2, change_seq - 1, $3, 'Kestrel check' FROM seq`,
      [ids.kestrelOrgId, kSurveyId, level!.site_id],
    );
    await sql(
      t.databaseUrl,
      `INSERT INTO stations (organisation_id, id, change_seq, survey_id, level_id, x_m, y_m) SELECT $1, $2, change_seq, $3, $4, 0, 0 FROM organisations WHERE id = $1`,
      [ids.kestrelOrgId, foreignId, kSurveyId, level!.id],
    );
    const [r] = await pushOk(surveyor, [mutationFor('stations', makeStation(scope, { id: foreignId }))]);
    expect(r).toMatchObject({ status: 'rejected', error: { code: 'RECORD_ID_UNAVAILABLE' } });
    const [stillTheirs] = await sql<{ organisation_id: string; x_m: number }>(t.databaseUrl, `SELECT organisation_id, x_m FROM stations WHERE id = $1`, [foreignId]);
    expect(stillTheirs).toEqual({ organisation_id: ids.kestrelOrgId, x_m: 0 });
  });

  it('lets only admins, reviewers and surveyors push', async () => {
    expectError(await push(viewer, [mutationFor('stations', makeStation(scope))]), 403, 'FORBIDDEN');
  });

  it('orders by the server’s sequence and only records device clocks', async () => {
    const station = makeStation(scope);
    const future = makeReading(scope, station.id, { measuredAt: '2031-01-01T00:00:00.000Z' });
    const past = makeReading(scope, station.id, { measuredAt: '2001-01-01T00:00:00.000+02:00' });
    const mFuture = { ...mutationFor('field_readings', future), queuedAt: '2031-01-01T00:00:05.000Z' };
    const mPast = { ...mutationFor('field_readings', past), queuedAt: '2001-01-01T00:00:05.000Z' };
    await pushOk(surveyor, [mutationFor('stations', station), mFuture]);
    await pushOk(surveyor, [mPast]);
    const rows = await sql<{ id: string; change_seq: string; measured_at: Date }>(t.databaseUrl, 'SELECT id, change_seq, measured_at FROM field_readings WHERE id IN ($1, $2) ORDER BY change_seq', [future.id, past.id]);
    expect(rows.map((r) => r.id)).toEqual([future.id, past.id]); // arrival order, whatever the clocks say
    expect(rows[1]!.measured_at.toISOString()).toBe('2000-12-31T22:00:00.000Z');
    const [queued] = await sql<{ queued_at: Date; device_id: string; user_id: string }>(t.databaseUrl, 'SELECT queued_at, device_id, user_id FROM sync_mutations WHERE mutation_id = $1', [mPast.mutationId]);
    expect(queued).toEqual({ queued_at: new Date('2001-01-01T00:00:05.000Z'), device_id: 'test-device-a', user_id: ids.users.surveyor });
  });

  it('ignores the object key a device sends and derives it from the file hash', async () => {
    const station = makeStation(scope);
    const sha = 'ab'.repeat(32);
    const reading = makeReading(scope, station.id, { photoSha256: sha, photoObjectKey: 'somewhere/else' });
    await pushOk(surveyor, [mutationFor('stations', station), mutationFor('field_readings', reading)]);
    const [row] = await sql<{ photo_object_key: string }>(t.databaseUrl, 'SELECT photo_object_key FROM field_readings WHERE id = $1', [reading.id]);
    expect(row!.photo_object_key).toBe(`orgs/${ids.orgId}/field_readings/${reading.id}/photo-${sha}`);
  });

  it('audits updates and deletions one by one and creations per batch', async () => {
    const station = makeStation(scope);
    const moved = edited(station, { xM: 11 });
    await pushOk(surveyor, [mutationFor('stations', station)], 'audit-device');
    await pushOk(surveyor, [mutationFor('stations', moved)], 'audit-device');
    const rows = await sql<{ action: string; entity: string; before: { xM: number } | null; after: { xM?: number; created?: { id: string }[] } }>(
      t.databaseUrl,
      `SELECT action, entity, before, after FROM audit_log WHERE (entity = 'stations' AND entity_id = $1) OR (entity = 'sync_batch' AND entity_id = 'audit-device') ORDER BY id`,
      [station.id],
    );
    expect(rows.map((r) => r.action)).toEqual(['sync_push', 'update', 'sync_push']);
    expect(rows[0]!.after.created?.map((c) => c.id)).toEqual([station.id]);
    expect(rows[1]).toMatchObject({ before: { xM: 10 }, after: { xM: 11 } });
  });

  it('stores every field of every record as sent, whether it varies across the batch or is the same in every row', async () => {
    // The write sends a column that has one value in every row once, and the others as arrays; quotes,
    // backslashes, commas, braces, nulls, tiny and negative numbers and nested JSON must all arrive intact.
    const walk = makeWalk(scope, { deviceLabel: 'tablet "B", shelf {2}', notes: 'back\\slash' });
    const stations = [makeStation(scope, { walkId: walk.id, xM: -3.25, yM: 1e-9, label: 'A,1', notes: null }), makeStation(scope, { walkId: walk.id, xM: 4, yM: 5, label: 'NULL', notes: 'a "quoted" note' })];
    const readings = [
      makeReading(scope, stations[0]!.id, { walkId: walk.id, magnitudeT: 2.5e-7, notes: 'first, with comma' }),
      makeReading(scope, stations[0]!.id, { walkId: walk.id, magnitudeT: null, bxT: -0.001, byT: 0, bzT: 3.5e-5, unit: 'G', probeOrientation: 'horizontal', notes: null }),
      makeReading(scope, stations[1]!.id, { walkId: walk.id, magnitudeT: 1.75, zeroed: false, backgroundT: 4.9e-5, notes: '' }),
    ];
    const sweeps = [
      makeSweep(scope, stations[1]!.id, { walkId: walk.id, peaks: [{ frequencyHz: 2.8e9, levelDbm: -61.5 }], notes: 'peak at "28 GHz", {x}' }),
      makeSweep(scope, stations[1]!.id, { walkId: walk.id, peaks: [], detector: 'rms', vbwHz: 3e4 }),
    ];
    const sent: [string, Record<string, unknown>][] = [['walks', walk], ...stations.map((r) => ['stations', r] as [string, Record<string, unknown>]), ...readings.map((r) => ['field_readings', r] as [string, Record<string, unknown>]), ...sweeps.map((r) => ['sweeps', r] as [string, Record<string, unknown>])];
    const results = await pushOk(surveyor, sent.map(([entity, r]) => mutationFor(entity as Mutation['entity'], r as never)));
    expect(results.every((r) => r.status === 'applied')).toBe(true);
    for (const [entity, record] of sent) {
      const [row] = await sql<{ j: Record<string, unknown> }>(t.databaseUrl, `SELECT to_jsonb(x) AS j FROM ${entity} x WHERE id = $1`, [record.id]);
      for (const [key, value] of Object.entries(record)) {
        const stored = row!.j[key.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`)];
        const isTime = typeof value === 'string' && /^\d{4}-\d\d-\d\dT/.test(value);
        expect(isTime ? Date.parse(stored as string) : stored, `${entity}.${key}`).toEqual(isTime ? Date.parse(value) : value);
      }
    }
  });

  it('gives every trace of a batch the sequences its answers carry, a create and an edit of one record in one batch included', async () => {
    // A batch of new records reserves its sequences in its write statement, a batch that changes an
    // existing record before it decides: both must leave the same numbers in the records, change_log,
    // the stored answers and the audit rows as in the answers sent back.
    const station = makeStation(scope);
    const first = makeReading(scope, station.id);
    const fixed = edited(first, { notes: 'probe re-zeroed' });
    const batch = [mutationFor('stations', station), mutationFor('field_readings', first), mutationFor('field_readings', fixed)];
    const fresh = await pushOk(surveyor, batch, 'trace-device');
    const later = edited(station, { xM: 12 });
    const changed = await pushOk(surveyor, [mutationFor('stations', later)], 'trace-device');
    const applied = [...fresh, ...changed].map((r) => {
      if (r.status !== 'applied') throw new Error(JSON.stringify(r));
      return r;
    });
    const seqs = applied.map((r) => r.changeSeq);
    expect(new Set(seqs).size).toBe(4);
    expect(seqs[1]! < seqs[2]! && seqs[0]! < seqs[1]! && seqs[2]! < seqs[3]!).toBe(true);
    const [readingRow] = await sql<{ change_seq: string; revision: number }>(t.databaseUrl, 'SELECT change_seq, revision FROM field_readings WHERE id = $1', [first.id]);
    expect({ seq: Number(readingRow!.change_seq), revision: readingRow!.revision }).toEqual({ seq: applied[2]!.changeSeq, revision: 2 });
    const [stationRow] = await sql<{ change_seq: string }>(t.databaseUrl, 'SELECT change_seq FROM stations WHERE id = $1', [station.id]);
    expect(Number(stationRow!.change_seq)).toBe(applied[3]!.changeSeq);
    const log = await sql<{ seq: string; entity_id: string; revision: number }>(
      t.databaseUrl,
      'SELECT seq, entity_id, revision FROM change_log WHERE entity_id IN ($1, $2) ORDER BY seq',
      [station.id, first.id],
    );
    expect(log.map((l) => [Number(l.seq), l.entity_id, l.revision])).toEqual([
      [applied[0]!.changeSeq, station.id, 1],
      [applied[1]!.changeSeq, first.id, 1],
      [applied[2]!.changeSeq, first.id, 2],
      [applied[3]!.changeSeq, station.id, 2],
    ]);
    const stored = await sql<{ mutation_id: string; applied_change_seq: string }>(
      t.databaseUrl,
      `SELECT mutation_id, applied_change_seq FROM sync_mutations WHERE device_id = 'trace-device'`,
    );
    expect(new Map(stored.map((r) => [r.mutation_id, Number(r.applied_change_seq)]))).toEqual(new Map(applied.map((r) => [r.mutationId, r.changeSeq])));
    const audits = await sql<{ action: string; after: { changeSeq?: number; created?: { id: string; changeSeq: number }[] } }>(
      t.databaseUrl,
      `SELECT action, after FROM audit_log WHERE entity_id IN ($1, $2, 'trace-device') ORDER BY id`,
      [station.id, first.id],
    );
    expect(audits.map((r) => r.action)).toEqual(['update', 'sync_push', 'update', 'sync_push']);
    expect(audits[0]!.after.changeSeq).toBe(applied[2]!.changeSeq);
    expect(audits[1]!.after.created).toEqual([
      { entity: 'stations', id: station.id, revision: 1, changeSeq: applied[0]!.changeSeq },
      { entity: 'field_readings', id: first.id, revision: 1, changeSeq: applied[1]!.changeSeq },
    ]);
    expect(audits[2]!.after.changeSeq).toBe(applied[3]!.changeSeq);
    expect(audits[3]!.after.created).toEqual([]);
    // A retry of the first batch replays the same answers.
    expect(await pushOk(surveyor, batch, 'trace-device')).toEqual(fresh);
  });
});
