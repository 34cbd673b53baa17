/**
 * Schema upgrade without data loss: a database written by the previous version's schema (version 1,
 * built here with raw Dexie from SCHEMA_V1, the layout kept verbatim in src/db/schema.ts) is opened by
 * the current FringewalkDb class, and every row is still there, reshaped. Likewise from version 3, the
 * layout before the [stationId+measuredAt] index of version 4.
 */
import Dexie from 'dexie';
import { v7 as uuidv7 } from 'uuid';
import { afterEach, describe, expect, it } from 'vitest';
import { CURRENT_SCHEMA_VERSION, FringewalkDb, SCHEMA_V1, SCHEMA_V3 } from '@/db';

const NAME = 'fringewalk-upgrade-test';

afterEach(async () => {
  await Dexie.delete(NAME);
});

describe('upgrading the device store', () => {
  it('a version-1 database opens with the current class: rows intact, outbox statuses, |B| and station colours filled in', async () => {
    const orgId = uuidv7();
    const surveyId = uuidv7();
    const levelId = uuidv7();
    const stationId = uuidv7();
    const userId = uuidv7();
    const old = new Dexie(NAME);
    old.version(1).stores(SCHEMA_V1);
    await old.open();
    const station = { id: stationId, organisationId: orgId, revision: 1, deleted: false, surveyId, levelId, walkId: null, roomId: null, label: 'by the door', xM: 1, yM: 2, heightM: 1, createdByUserId: userId, notes: null };
    const reading = (id: string, over: object) => ({
      id, organisationId: orgId, revision: 1, deleted: false, surveyId, stationId, walkId: null, instrumentId: null, surveyorUserId: userId,
      magnitudeT: null, bxT: null, byT: null, bzT: null, unit: 'mT', probeOrientation: 'three_axis', heightM: 1, backgroundT: null,
      zeroed: true, measuredAt: '2026-11-17T09:00:00.000Z', notes: null, photoObjectKey: null, photoSha256: null, ...over,
    });
    const components = reading(uuidv7(), { bxT: 6e-4, byT: 8e-4, bzT: 0, measuredAt: '2026-11-17T10:00:00.000Z' });
    const magnitude = reading(uuidv7(), { magnitudeT: 2e-3, measuredAt: '2026-11-17T09:00:00.000Z' });
    const tombstoned = reading(uuidv7(), { magnitudeT: 9e-3, deleted: true, revision: 2, measuredAt: '2026-11-17T11:00:00.000Z' });
    await old.table('stations').put(station);
    await old.table('fieldReadings').bulkPut([components, magnitude, tombstoned]);
    const mutation = (record: { id: string }, entity: string, baseRevision = 0) => ({
      mutationId: uuidv7(), entity, recordId: record.id, surveyId, baseRevision, payload: record, queuedAt: '2026-11-17T10:00:01.000Z',
    });
    await old.table('outbox').bulkAdd([mutation(station, 'stations'), mutation(components, 'field_readings'), mutation(magnitude, 'field_readings'), mutation(tombstoned, 'field_readings', 1)]);
    await old.table('meta').put({ key: 'deviceId', value: 'device-from-v1' });
    old.close();

    const current = new FringewalkDb(NAME);
    await current.open();
    try {
      expect(current.verno).toBe(CURRENT_SCHEMA_VERSION);
      // Intact: every row, every original field.
      expect(await current.fieldReadings.count()).toBe(3);
      expect(await current.fieldReadings.get(components.id)).toMatchObject(components);
      expect(await current.stations.get(stationId)).toMatchObject(station);
      expect((await current.meta.get('deviceId'))?.value).toBe('device-from-v1');
      const outbox = await current.outbox.orderBy('seq').toArray();
      expect(outbox.map((m) => m.recordId)).toEqual([stationId, components.id, magnitude.id, tombstoned.id]);
      expect(outbox.map((m) => m.payload)).toEqual([station, components, magnitude, tombstoned]);
      // Reshaped: statuses, |B| (√(6² + 8²) × 10⁻⁴ T = 10⁻³ T), and the station's newest LIVE reading
      // (the tombstone at 11:00 does not count; 10:00 beats 09:00).
      expect(outbox.every((m) => m.status === 'pending' && m.error === null)).toBe(true);
      expect((await current.fieldReadings.get(components.id))!.fieldT).toBeCloseTo(1e-3, 15);
      expect((await current.fieldReadings.get(magnitude.id))!.fieldT).toBe(2e-3);
      expect((await current.stations.get(stationId))!.latestFieldT).toBeCloseTo(1e-3, 15);
      // New tables exist and new indexes answer.
      expect(await current.drafts.count()).toBe(0);
      expect(await current.attachments.count()).toBe(0);
      // The version-2 index the pending counts read: the old entries are in it, one key per record.
      const keys = await current.outbox.where('[surveyId+entity+recordId]').between([surveyId], [surveyId, '\uffff']).uniqueKeys();
      expect(keys).toHaveLength(4);
    } finally {
      current.close();
    }
  });

  it('a version-3 database opens with the current class: rows intact, and readings answer by station, newest first', async () => {
    const orgId = uuidv7();
    const surveyId = uuidv7();
    const stationId = uuidv7();
    const userId = uuidv7();
    const old = new Dexie(NAME);
    old.version(3).stores(SCHEMA_V3);
    await old.open();
    const station = { id: stationId, organisationId: orgId, revision: 1, deleted: false, surveyId, levelId: uuidv7(), walkId: null, roomId: null, label: 'S1', xM: 1, yM: 2, heightM: 1, createdByUserId: userId, notes: null, latestFieldT: 3e-3 };
    const reading = (measuredAt: string, fieldT: number) => ({
      id: uuidv7(), organisationId: orgId, revision: 1, deleted: false, surveyId, stationId, walkId: null, instrumentId: null, surveyorUserId: userId,
      magnitudeT: fieldT, bxT: null, byT: null, bzT: null, unit: 'mT', probeOrientation: 'three_axis', heightM: 1, backgroundT: null,
      zeroed: true, measuredAt, notes: null, photoObjectKey: null, photoSha256: null, fieldT,
    });
    const rows = [reading('2026-11-17T09:00:00.000Z', 1e-3), reading('2026-11-17T11:00:00.000Z', 3e-3), reading('2026-11-17T10:00:00.000Z', 2e-3)];
    await old.table('stations').put(station);
    await old.table('fieldReadings').bulkPut(rows);
    await old.table('outbox').add({ mutationId: uuidv7(), entity: 'stations', recordId: stationId, surveyId, baseRevision: 0, payload: station, queuedAt: '2026-11-17T09:00:01.000Z', status: 'pending', error: null });
    await old.table('syncConflicts').put({ entity: 'stations', recordId: stationId, surveyId, origin: 'pull', conflictId: null, serverRevision: 2, serverVersion: null, localVersion: null, message: 'kept', markedAt: '2026-11-17T12:00:00.000Z' });
    old.close();

    const current = new FringewalkDb(NAME);
    await current.open();
    try {
      expect(current.verno).toBe(CURRENT_SCHEMA_VERSION);
      expect(CURRENT_SCHEMA_VERSION).toBe(4);
      expect(await current.fieldReadings.toArray()).toEqual(expect.arrayContaining(rows));
      expect(await current.fieldReadings.count()).toBe(3);
      expect(await current.stations.get(stationId)).toEqual(station);
      expect(await current.outbox.count()).toBe(1);
      expect(await current.syncConflicts.count()).toBe(1);
      // The new index holds the rows written before it existed, in measuredAt order.
      const byStation = await current.fieldReadings.where('[stationId+measuredAt]').between([stationId, ''], [stationId, '\uffff']).toArray();
      expect(byStation.map((r) => r.measuredAt)).toEqual(['2026-11-17T09:00:00.000Z', '2026-11-17T10:00:00.000Z', '2026-11-17T11:00:00.000Z']);
    } finally {
      current.close();
    }
  });
});
