/**
 * One transaction per save, on a real Dexie over fake-indexeddb: a station made by the first reading
 * (or sweep) on a new spot is written with that record or not at all; the station's latest |B| follows
 * the newest live reading through the [stationId+measuredAt] index; the pending counts stay right as
 * the outbox grows and shrinks.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { v7 as uuidv7 } from 'uuid';
import { CaptureError, CaptureValidationError, db } from '@/db';
import { deleteFieldReading, getPendingCounts, getWalkEntries, saveFieldReading, saveFieldReadingWith, saveStation, saveSweepWith } from '@/features/capture/data';
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

describe('the first reading on a new spot creates its station in the same transaction', () => {
  it('saves the station, then the reading at it; the outbox holds the station first', async () => {
    const { reading, station } = await saveFieldReadingWith(readingInput(c, 'placeholder-replaced', { magnitudeT: 0.12 }), { newStation: stationInput(c) });
    expect(station).not.toBeNull();
    expect(reading.stationId).toBe(station!.id);
    expect(await db.stations.get(station!.id)).toMatchObject({ revision: 1, latestFieldT: 0.12 });
    const outbox = await db.outbox.orderBy('seq').toArray();
    expect(outbox.map((m) => [m.entity, m.recordId])).toEqual([
      ['stations', station!.id],
      ['field_readings', reading.id],
    ]);
  });

  it('a reading refused by the schema leaves no station and no outbox entry', async () => {
    const error = await saveFieldReadingWith(readingInput(c, 'placeholder-replaced', { heightM: -2 }), { newStation: stationInput(c) }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(CaptureValidationError);
    expect(await db.stations.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });

  it('a reading that fails inside the transaction leaves no station and no outbox entry', async () => {
    const failReading = () => {
      throw new Error('the store refused this reading');
    };
    db.fieldReadings.hook('creating', failReading);
    try {
      const error = await saveFieldReadingWith(readingInput(c, 'placeholder-replaced'), { newStation: stationInput(c) }).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(CaptureError);
      expect((error as Error).message).toContain('the store refused this reading');
    } finally {
      db.fieldReadings.hook('creating').unsubscribe(failReading);
    }
    expect(await db.stations.count()).toBe(0);
    expect(await db.fieldReadings.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });

  it('a station refused by the schema stops the reading too', async () => {
    const error = await saveFieldReadingWith(readingInput(c, 'placeholder-replaced'), { newStation: stationInput(c, { xM: Number.NaN }) }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(CaptureValidationError);
    expect(await db.fieldReadings.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });

  it('a sweep that fails inside the transaction leaves no station either', async () => {
    const failSweep = () => {
      throw new Error('the store refused this sweep');
    };
    db.sweeps.hook('creating', failSweep);
    try {
      await expect(saveSweepWith(sweepInput(c, 'placeholder-replaced'), { newStation: stationInput(c) })).rejects.toBeInstanceOf(CaptureError);
    } finally {
      db.sweeps.hook('creating').unsubscribe(failSweep);
    }
    expect(await db.stations.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
    const { sweep, station } = await saveSweepWith(sweepInput(c, 'placeholder-replaced'), { newStation: stationInput(c) });
    expect(sweep.stationId).toBe(station!.id);
    expect((await db.outbox.orderBy('seq').toArray()).map((m) => m.entity)).toEqual(['stations', 'sweeps']);
  });
});

describe("a station's latest |B|", () => {
  it('is the newest live reading by measuredAt, whatever order they were saved in, and skips tombstones', async () => {
    const station = await saveStation(stationInput(c));
    const at = (h: number) => `2026-11-17T${String(h).padStart(2, '0')}:00:00.000Z`;
    const ten = await saveFieldReading(readingInput(c, station.id, { magnitudeT: 0.01, measuredAt: at(10) }));
    await saveFieldReading(readingInput(c, station.id, { magnitudeT: 0.009, measuredAt: at(9) }));
    expect((await db.stations.get(station.id))!.latestFieldT).toBe(0.01);
    const eleven = await saveFieldReading(readingInput(c, station.id, { magnitudeT: 0.011, measuredAt: at(11) }));
    expect((await db.stations.get(station.id))!.latestFieldT).toBe(0.011);
    await deleteFieldReading(eleven.id);
    expect((await db.stations.get(station.id))!.latestFieldT).toBe(0.01);
    await deleteFieldReading(ten.id);
    expect((await db.stations.get(station.id))!.latestFieldT).toBe(0.009);
    // Another station's newer reading does not leak in.
    const other = await saveStation(stationInput(c, { label: 'S2' }));
    await saveFieldReading(readingInput(c, other.id, { magnitudeT: 0.5, measuredAt: at(12) }));
    expect((await db.stations.get(station.id))!.latestFieldT).toBe(0.009);
    expect((await db.stations.get(other.id))!.latestFieldT).toBe(0.5);
  });

  it('moves with a correction that puts the reading at another station', async () => {
    const a = await saveStation(stationInput(c));
    const b = await saveStation(stationInput(c, { label: 'S2' }));
    const r = await saveFieldReading(readingInput(c, a.id, { magnitudeT: 0.02 }));
    const { id: _id, revision: _rev, deleted: _del, ...rest } = r;
    await saveFieldReading({ ...rest, id: r.id, stationId: b.id });
    expect((await db.stations.get(a.id))!.latestFieldT).toBeNull();
    expect((await db.stations.get(b.id))!.latestFieldT).toBe(0.02);
  });
});

describe('the walk list', () => {
  it('reads the newest N live entries even when tombstones sit at the top', async () => {
    const station = await saveStation(stationInput(c));
    const walkId = uuidv7();
    const saved = [];
    for (let i = 0; i < 30; i++) {
      saved.push(await saveFieldReading(readingInput(c, station.id, { walkId, magnitudeT: (i + 1) * 1e-3, measuredAt: new Date(Date.UTC(2026, 10, 17, 9, i)).toISOString() })));
    }
    // The 12 newest are deleted: a first page of limit + 8 would hold only tombstones and 8 live ones.
    for (const r of saved.slice(-12)) await deleteFieldReading(r.id);
    const entries = await getWalkEntries(walkId, { limit: 10 });
    expect(entries.map((e) => (e.kind === 'reading' ? e.reading.id : ''))).toEqual(saved.slice(8, 18).reverse().map((r) => r.id));
    expect(await getWalkEntries(walkId)).toHaveLength(18);
  });
});

describe('pending counts as the outbox grows and shrinks', () => {
  it('count records once, follow appends and notice entries leaving (a push)', async () => {
    const station = await saveStation(stationInput(c));
    const r1 = await saveFieldReading(readingInput(c, station.id));
    expect(await getPendingCounts(c.surveyId)).toMatchObject({ stations: 1, readings: 1, total: 2 });
    // An edit adds a mutation for the same record: still one reading.
    const { id: _id, revision: _rev, deleted: _del, ...rest } = r1;
    await saveFieldReading({ ...rest, id: r1.id, notes: 'corrected' });
    expect(await getPendingCounts(c.surveyId)).toMatchObject({ readings: 1, total: 2 });
    await saveFieldReading(readingInput(c, station.id));
    expect(await getPendingCounts(c.surveyId)).toMatchObject({ readings: 2, total: 3 });
    expect(await getPendingCounts()).toMatchObject({ readings: 2, total: 3 });
    // The sync pushed the station and the first reading (both its mutations) and removed them.
    const pushed = (await db.outbox.toArray()).filter((m) => m.recordId === station.id || m.recordId === r1.id);
    await db.outbox.bulkDelete(pushed.map((m) => m.seq!));
    expect(await getPendingCounts(c.surveyId)).toMatchObject({ stations: 0, readings: 1, total: 1 });
    // One removed and one added between two reads: the totals would match a naive append, but not the records.
    const last = (await db.outbox.toArray())[0]!;
    await db.outbox.delete(last.seq!);
    await saveFieldReading(readingInput(c, station.id));
    expect(await getPendingCounts(c.surveyId)).toMatchObject({ readings: 1, total: 1 });
    // Another survey's entries do not count in this survey's figure, but do in the device total.
    const other = captureContext();
    const s2 = await saveStation(stationInput(other));
    await saveFieldReading(readingInput(other, s2.id));
    expect(await getPendingCounts(c.surveyId)).toMatchObject({ readings: 1, total: 1 });
    expect(await getPendingCounts()).toMatchObject({ readings: 2, stations: 1, total: 3 });
  });
});
