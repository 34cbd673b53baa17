/**
 * Builders for sync tests and the sync benchmark: walks, stations, readings, sweeps and their outbox
 * mutations shaped exactly as a device makes them (shared/schemas/capture.ts, shared/sync/mutation.ts).
 * No test-runner imports, so the benchmark can use it too. The values are invented test data.
 */
import { v7 as uuidv7 } from 'uuid';
import type { FieldReading, Station, Sweep, Walk } from '../../shared/schemas/capture';
import type { Mutation } from '../../shared/sync/mutation';

export interface Scope {
  orgId: string;
  surveyId: string;
  levelId: string;
  userId: string;
}

export function makeWalk(s: Scope, over: Partial<Walk> = {}): Walk {
  return {
    id: uuidv7(),
    organisationId: s.orgId,
    revision: 1,
    deleted: false,
    surveyId: s.surveyId,
    surveyorUserId: s.userId,
    deviceId: 'test-device-a',
    deviceLabel: 'Test tablet',
    startedAt: '2026-11-18T08:00:00.000Z',
    endedAt: null,
    notes: null,
    ...over,
  };
}

export function makeStation(s: Scope, over: Partial<Station> = {}): Station {
  return {
    id: uuidv7(),
    organisationId: s.orgId,
    revision: 1,
    deleted: false,
    surveyId: s.surveyId,
    levelId: s.levelId,
    walkId: null,
    roomId: null,
    label: null,
    xM: 10,
    yM: 10,
    heightM: 1,
    createdByUserId: s.userId,
    notes: null,
    ...over,
  };
}

export function makeReading(s: Scope, stationId: string, over: Partial<FieldReading> = {}): FieldReading {
  return {
    id: uuidv7(),
    organisationId: s.orgId,
    revision: 1,
    deleted: false,
    surveyId: s.surveyId,
    stationId,
    walkId: null,
    instrumentId: null,
    surveyorUserId: s.userId,
    magnitudeT: 0.5e-3,
    bxT: null,
    byT: null,
    bzT: null,
    unit: 'mT',
    probeOrientation: 'vertical',
    heightM: 1,
    backgroundT: null,
    zeroed: true,
    measuredAt: '2026-11-18T09:00:00.000Z',
    notes: null,
    photoObjectKey: null,
    photoSha256: null,
    ...over,
  };
}

export function makeSweep(s: Scope, stationId: string, over: Partial<Sweep> = {}): Sweep {
  return {
    id: uuidv7(),
    organisationId: s.orgId,
    revision: 1,
    deleted: false,
    surveyId: s.surveyId,
    stationId,
    walkId: null,
    analyserId: null,
    antennaId: null,
    surveyorUserId: s.userId,
    measuredAt: '2026-11-18T09:30:00.000Z',
    startHz: 1e6,
    stopHz: 3e9,
    rbwHz: 1e5,
    vbwHz: null,
    referenceLevelDbm: 0,
    attenuationDb: null,
    detector: 'peak',
    peaks: [],
    traceObjectKey: null,
    traceSha256: null,
    heightM: 1,
    notes: null,
    ...over,
  };
}

type AnyRecord = Walk | Station | FieldReading | Sweep;

/** The outbox entry a device queues for a record (created: base 0; edited from revision r: base r). */
export function mutationFor(entity: Mutation['entity'], record: AnyRecord, baseRevision = record.revision - 1): Mutation {
  return {
    mutationId: uuidv7(),
    entity,
    recordId: record.id,
    surveyId: record.surveyId,
    baseRevision,
    payload: record as unknown as Record<string, unknown>,
    queuedAt: '2026-11-18T09:00:05.000Z',
  };
}

/** The next version of a record as a device makes it: revision + 1, with changes. */
export function edited<T extends AnyRecord>(record: T, changes: Partial<T>): T {
  return { ...record, ...changes, revision: record.revision + 1 };
}
