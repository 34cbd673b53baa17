/**
 * The device store and its outbox, on a real Dexie over fake-indexeddb: atomic record + outbox writes,
 * revisions, tombstones, pending counts, drafts across a reopen, typed errors for bad input and a full disk.
 */
import { renderHook, waitFor } from '@testing-library/react';
import { createHash } from 'node:crypto';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { FieldReadingSchema, StationSchema } from '@shared/schemas/capture';
import { MutationSchema } from '@shared/sync/mutation';
import { CaptureError, CaptureValidationError, db, DB_NAME, FringewalkDb, StorageFullError, type OutboxRow } from '@/db';
import {
  clearDraft,
  deleteFieldReading,
  deleteStation,
  deleteSweep,
  endWalk,
  getDraft,
  getPendingCounts,
  getStations,
  getWalkEntries,
  pendingSummary,
  saveDraft,
  saveFieldReading,
  saveStation,
  saveSweep,
  setLastFieldUnit,
  startWalk,
  useLastFieldUnit,
  usePendingCounts,
} from '@/features/capture/data';
import { captureContext, readingInput, stationInput, sweepInput, type CaptureContext } from './capture-fixtures';

let c: CaptureContext;

beforeEach(async () => {
  await db.delete();
  await db.open();
  c = captureContext();
});
afterEach(() => {
  db.close();
});

const outboxFor = (recordId: string) => db.outbox.where('recordId').equals(recordId).sortBy('seq');

describe('a write and its outbox entry are one transaction', () => {
  it('a new reading is stored at revision 1 with one pending mutation holding the whole record (base revision 0)', async () => {
    const station = await saveStation(stationInput(c));
    const reading = await saveFieldReading(readingInput(c, station.id));
    expect(reading.revision).toBe(1);
    expect(reading.deleted).toBe(false);
    // UUID v7 (RFC 9562 §5.7): version nibble 7, variant 10xx.
    expect(reading.id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-7[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    const stored = await db.fieldReadings.get(reading.id);
    expect(stored).toMatchObject({ ...reading, fieldT: 0.5e-3 });
    const [mutation, ...rest] = await outboxFor(reading.id);
    expect(rest).toEqual([]);
    expect(MutationSchema.parse(mutation)).toMatchObject({ entity: 'field_readings', recordId: reading.id, surveyId: c.surveyId, baseRevision: 0 });
    expect(mutation!.status).toBe('pending');
    // The payload is the wire record, device-only columns left out, and passes the server's schema.
    expect(mutation!.payload).toEqual(reading);
    expect(mutation!.payload).not.toHaveProperty('fieldT');
    expect(FieldReadingSchema.parse(mutation!.payload)).toEqual(reading);
  });

  it('when the outbox write fails inside the transaction, the record is not written either', async () => {
    const station = await saveStation(stationInput(c));
    const failOutbox = () => {
      throw new Error('outbox refused this entry');
    };
    db.outbox.hook('creating', failOutbox);
    try {
      const error = await saveFieldReading(readingInput(c, station.id)).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(CaptureError);
      expect((error as CaptureError).code).toBe('STORAGE_FAILED');
      expect((error as Error).message).toContain('outbox refused this entry');
    } finally {
      db.outbox.hook('creating').unsubscribe(failOutbox);
    }
    expect(await db.fieldReadings.count()).toBe(0);
    expect(await db.outbox.filter((m) => m.entity === 'field_readings').count()).toBe(0);
    // The station from before is untouched.
    expect(await db.stations.get(station.id)).toBeDefined();
  });

  it('a duplicate mutation id (an invalid key for the unique index) rolls back an edit too', async () => {
    const station = await saveStation(stationInput(c));
    const [first] = await outboxFor(station.id);
    const reuse = (_key: unknown, entry: OutboxRow) => {
      entry.mutationId = first!.mutationId;
    };
    db.outbox.hook('creating', reuse);
    try {
      await expect(saveStation({ ...stationInput(c, { label: 'moved' }), id: station.id })).rejects.toBeInstanceOf(CaptureError);
    } finally {
      db.outbox.hook('creating').unsubscribe(reuse);
    }
    expect(await db.stations.get(station.id)).toMatchObject({ label: 'S1', revision: 1 });
    expect(await outboxFor(station.id)).toHaveLength(1);
  });

  it('a full disk (QuotaExceededError) surfaces as StorageFullError and writes nothing', async () => {
    const station = await saveStation(stationInput(c));
    const quota = () => {
      throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
    };
    db.fieldReadings.hook('creating', quota);
    try {
      const error = await saveFieldReading(readingInput(c, station.id)).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(StorageFullError);
      expect((error as StorageFullError).code).toBe('STORAGE_FULL');
      expect((error as Error).message).toMatch(/out of storage space/);
    } finally {
      db.fieldReadings.hook('creating').unsubscribe(quota);
    }
    expect(await db.fieldReadings.count()).toBe(0);
    expect(await db.outbox.filter((m) => m.entity === 'field_readings').count()).toBe(0);
  });
});

describe('bad input', () => {
  it('throws CaptureValidationError with zod’s message and path, and writes nothing', async () => {
    const station = await saveStation(stationInput(c));
    const before = await db.outbox.count();
    const error = await saveFieldReading(readingInput(c, station.id, { magnitudeT: null })).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(CaptureValidationError);
    const v = error as CaptureValidationError;
    expect(v.code).toBe('CAPTURE_INVALID');
    expect(v.message).toContain('Enter |B| or its three components.');
    expect(v.fieldErrors).toEqual({ magnitudeT: 'Enter |B| or its three components.' });
    expect(await db.fieldReadings.count()).toBe(0);
    expect(await db.outbox.count()).toBe(before);
  });

  it('each record kind is checked by its shared schema (negative height, sweep span, NaN position)', async () => {
    const station = await saveStation(stationInput(c));
    await expect(saveFieldReading(readingInput(c, station.id, { heightM: -0.2 }))).rejects.toThrow('Probe height cannot be negative.');
    await expect(saveSweep(sweepInput(c, station.id, { startHz: 3e9, stopHz: 2e9, peaks: [] }))).rejects.toThrow('Stop frequency must be above the start frequency.');
    await expect(saveStation(stationInput(c, { xM: Number.NaN }))).rejects.toThrow('x must be a number.');
    expect(await db.fieldReadings.count()).toBe(0);
    expect(await db.sweeps.count()).toBe(0);
    expect(await db.stations.count()).toBe(1);
  });
});

describe('edits and tombstones', () => {
  it('each edit bumps the revision by one and queues a mutation with the revision it started from', async () => {
    const station = await saveStation(stationInput(c));
    const r1 = await saveFieldReading(readingInput(c, station.id));
    const r2 = await saveFieldReading({ ...readingInput(c, station.id, { magnitudeT: 0.6e-3 }), id: r1.id });
    const r3 = await saveFieldReading({ ...readingInput(c, station.id, { magnitudeT: null, bxT: 3e-4, byT: 4e-4, bzT: 0 }), id: r1.id });
    expect([r1.revision, r2.revision, r3.revision]).toEqual([1, 2, 3]);
    const queue = await outboxFor(r1.id);
    expect(queue.map((m) => m.baseRevision)).toEqual([0, 1, 2]);
    expect(queue.map((m) => m.payload.revision)).toEqual([1, 2, 3]);
    expect(new Set(queue.map((m) => m.mutationId)).size).toBe(3);
    // |B| from components: √(3² + 4² + 0²) × 10⁻⁴ T = 5 × 10⁻⁴ T (Pythagoras).
    expect((await db.fieldReadings.get(r1.id))!.fieldT).toBeCloseTo(5e-4, 15);
    expect((await db.stations.get(station.id))!.latestFieldT).toBeCloseTo(5e-4, 15);
  });

  it('deleting a reading or sweep leaves a tombstone at revision + 1, queued like an edit; lists leave it out', async () => {
    const walk = await startWalk({ surveyId: c.surveyId, orgId: c.orgId, userId: c.userId });
    const station = await saveStation(stationInput(c, { walkId: walk.id }));
    const older = await saveFieldReading(readingInput(c, station.id, { walkId: walk.id, magnitudeT: 1e-3, measuredAt: '2026-11-17T08:00:00.000Z' }));
    const newer = await saveFieldReading(readingInput(c, station.id, { walkId: walk.id, magnitudeT: 2e-3, measuredAt: '2026-11-17T09:00:00.000Z' }));
    const sweep = await saveSweep(sweepInput(c, station.id, { walkId: walk.id }));
    expect((await db.stations.get(station.id))!.latestFieldT).toBe(2e-3);

    const gone = await deleteFieldReading(newer.id);
    expect(gone).toMatchObject({ id: newer.id, deleted: true, revision: 2 });
    expect(await db.fieldReadings.get(newer.id)).toMatchObject({ deleted: true, revision: 2, magnitudeT: 2e-3 });
    expect((await outboxFor(newer.id)).map((m) => [m.baseRevision, m.payload.deleted])).toEqual([[0, false], [1, true]]);
    // The station's colour follows the newest live reading.
    expect((await db.stations.get(station.id))!.latestFieldT).toBe(1e-3);

    await deleteSweep(sweep.id);
    expect(await db.sweeps.get(sweep.id)).toMatchObject({ deleted: true, revision: 2 });
    const entries = await getWalkEntries(walk.id);
    expect(entries.map((e) => (e.kind === 'reading' ? e.reading.id : e.sweep.id))).toEqual([older.id]);

    // Deleting twice changes nothing more; editing a tombstone is refused.
    await deleteFieldReading(newer.id);
    expect(await outboxFor(newer.id)).toHaveLength(2);
    await expect(saveFieldReading({ ...readingInput(c, station.id), id: newer.id })).rejects.toMatchObject({ code: 'RECORD_NOT_FOUND' });
  });

  it('a station with live readings is not deleted; once they are tombstoned it is', async () => {
    const station = await saveStation(stationInput(c));
    const reading = await saveFieldReading(readingInput(c, station.id));
    await expect(deleteStation(station.id)).rejects.toMatchObject({ code: 'RECORD_CONFLICT' });
    expect(await db.stations.get(station.id)).toMatchObject({ deleted: false, revision: 1 });
    await deleteFieldReading(reading.id);
    const gone = await deleteStation(station.id);
    expect(gone).toMatchObject({ deleted: true, revision: 2 });
    expect(StationSchema.parse((await outboxFor(station.id)).at(-1)!.payload)).toMatchObject({ deleted: true, revision: 2 });
    expect(await getStations(c.surveyId, c.levelId)).toEqual([]);
  });

  it('walk entries come newest first, readings and sweeps together', async () => {
    const walk = await startWalk({ surveyId: c.surveyId, orgId: c.orgId, userId: c.userId });
    const station = await saveStation(stationInput(c, { walkId: walk.id }));
    const a = await saveFieldReading(readingInput(c, station.id, { walkId: walk.id, measuredAt: '2026-11-17T09:00:00.000Z' }));
    const s = await saveSweep(sweepInput(c, station.id, { walkId: walk.id, measuredAt: '2026-11-17T09:01:00.000Z' }));
    const b = await saveFieldReading(readingInput(c, station.id, { walkId: walk.id, measuredAt: '2026-11-17T09:02:00.000Z' }));
    const ids = (await getWalkEntries(walk.id)).map((e) => (e.kind === 'reading' ? e.reading.id : e.sweep.id));
    expect(ids).toEqual([b.id, s.id, a.id]);
    expect((await getWalkEntries(walk.id, { limit: 2 })).length).toBe(2);
  });
});

describe('walks', () => {
  it('one open walk per survey on this device: starting again resumes it; after it ends a new one starts', async () => {
    const first = await startWalk({ surveyId: c.surveyId, orgId: c.orgId, userId: c.userId });
    const again = await startWalk({ surveyId: c.surveyId, orgId: c.orgId, userId: c.userId });
    expect(again.id).toBe(first.id);
    const ended = await endWalk(first.id);
    expect(ended.revision).toBe(2);
    expect(ended.endedAt).not.toBeNull();
    const next = await startWalk({ surveyId: c.surveyId, orgId: c.orgId, userId: c.userId });
    expect(next.id).not.toBe(first.id);
    expect(next.deviceId).toBe(first.deviceId);
    expect((await outboxFor(first.id)).map((m) => m.baseRevision)).toEqual([0, 1]);
  });
});

describe('pending counts', () => {
  it('count records (not mutations) per survey and kind, and read as a sentence', async () => {
    const other = captureContext();
    const station = await saveStation(stationInput(c));
    for (let i = 0; i < 14; i++) await saveFieldReading(readingInput(c, station.id, { measuredAt: `2026-11-17T09:${String(i).padStart(2, '0')}:00.000Z` }));
    const first = (await db.fieldReadings.toArray())[0]!;
    await saveFieldReading({ ...readingInput(c, station.id, { magnitudeT: 1e-3 }), id: first.id }); // an edit: still 14 readings
    await saveSweep(sweepInput(c, station.id));
    const elsewhere = await saveStation(stationInput(other));
    await saveFieldReading(readingInput(other, elsewhere.id));

    const counts = await getPendingCounts(c.surveyId);
    expect(counts).toEqual({ readings: 14, sweeps: 1, stations: 1, walks: 0, total: 16, rejected: 0 });
    expect(pendingSummary({ ...counts, sweeps: 0, stations: 0 })).toBe('14 readings not yet synced');
    expect(pendingSummary(counts)).toBe('14 readings, 1 sweep and 1 station not yet synced');
    expect(await getPendingCounts()).toMatchObject({ readings: 15, stations: 2, total: 18 });
    expect(pendingSummary(await getPendingCounts(captureContext().surveyId))).toBeNull();

    // A mutation the server refused stays, marked, and is counted as rejected.
    const [m] = await outboxFor(first.id);
    await db.outbox.update(m!.seq!, { status: 'rejected', error: 'Probe height cannot be negative.' });
    expect((await getPendingCounts(c.surveyId)).rejected).toBe(1);
  });

  it('usePendingCounts follows writes live', async () => {
    const station = await saveStation(stationInput(c));
    const { result, unmount } = renderHook(() => usePendingCounts(c.surveyId));
    await waitFor(() => expect(result.current?.stations).toBe(1));
    await saveFieldReading(readingInput(c, station.id));
    await waitFor(() => expect(result.current?.readings).toBe(1));
    unmount();
  });
});

describe('surviving a reload', () => {
  it('drafts, readings, the outbox and the last unit are there in a new Dexie instance', async () => {
    const station = await saveStation(stationInput(c));
    await saveFieldReading(readingInput(c, station.id));
    await saveDraft(`reading:${station.id}`, { value: '0.51', unit: 'mT', notes: 'by the door' });
    await setLastFieldUnit('G');
    db.close();

    const reopened = new FringewalkDb(DB_NAME);
    await reopened.open();
    try {
      expect((await reopened.drafts.get(`reading:${station.id}`))?.value).toEqual({ value: '0.51', unit: 'mT', notes: 'by the door' });
      expect(await reopened.fieldReadings.count()).toBe(1);
      expect(await reopened.outbox.count()).toBe(2);
      expect((await reopened.meta.get('lastFieldUnit'))?.value).toBe('G');
    } finally {
      reopened.close();
    }
    await db.open();
    expect(await getDraft(`reading:${station.id}`)).toMatchObject({ value: '0.51' });
    await clearDraft(`reading:${station.id}`);
    expect(await getDraft(`reading:${station.id}`)).toBeUndefined();
  });

  it('the last unit defaults to mT and then remembers the choice', async () => {
    const { result, unmount } = renderHook(() => useLastFieldUnit());
    await waitFor(() => expect(result.current).toBe('mT'));
    await setLastFieldUnit('µT');
    await waitFor(() => expect(result.current).toBe('µT'));
    unmount();
  });
});

describe('attachments', () => {
  it('a photo is kept with the reading in the same transaction, its SHA-256 recorded on the reading', async () => {
    const station = await saveStation(stationInput(c));
    const bytes = new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 1, 2, 3, 4, 5]);
    const reading = await saveFieldReading(readingInput(c, station.id), new Blob([bytes], { type: 'image/jpeg' }));
    // Checked against Node's own SHA-256 (node:crypto), not the Web Crypto path under test.
    const expected = createHash('sha256').update(bytes).digest('hex');
    expect(reading.photoSha256).toBe(expected);
    expect(reading.photoObjectKey).toBeNull();
    const [attachment] = await db.attachments.where('recordId').equals(reading.id).toArray();
    expect(attachment).toMatchObject({ kind: 'photo', mime: 'image/jpeg', bytes: bytes.length, sha256: expected, uploadedAt: null });
    expect(new Uint8Array(attachment!.data)).toEqual(bytes);
    expect((await outboxFor(reading.id))[0]!.payload.photoSha256).toBe(expected);
  });
});
