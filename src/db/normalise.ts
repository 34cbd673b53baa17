/**
 * Loaded rows pass through these before the UI sees them (STYLE.md, "Data on the device"). IndexedDB
 * keeps whatever an older build wrote; a row written before a column existed comes back without it.
 * Version upgrades reshape rows once, but a row synced in from an older device, or written by a tab
 * still running the previous build, can still lack a field: fill it here rather than crash a list.
 */
import { readingFieldTesla } from '@shared/schemas/capture';
import type { FieldReadingRow, OutboxRow, StationRow, SweepRow, WalkRow } from './types';

const orNull = <T>(value: T | undefined): T | null => (value === undefined ? null : value);

export function normaliseStation(row: StationRow): StationRow {
  return {
    ...row,
    walkId: orNull(row.walkId),
    roomId: orNull(row.roomId),
    label: orNull(row.label),
    notes: orNull(row.notes),
    createdByUserId: orNull(row.createdByUserId),
    heightM: row.heightM ?? 1,
    deleted: row.deleted ?? false,
    latestFieldT: row.latestFieldT ?? null,
  };
}

export function normaliseFieldReading(row: FieldReadingRow): FieldReadingRow {
  const base = {
    ...row,
    walkId: orNull(row.walkId),
    instrumentId: orNull(row.instrumentId),
    magnitudeT: orNull(row.magnitudeT),
    bxT: orNull(row.bxT),
    byT: orNull(row.byT),
    bzT: orNull(row.bzT),
    backgroundT: orNull(row.backgroundT),
    zeroed: row.zeroed ?? false,
    notes: orNull(row.notes),
    photoObjectKey: orNull(row.photoObjectKey),
    photoSha256: orNull(row.photoSha256),
    deleted: row.deleted ?? false,
  };
  return { ...base, fieldT: typeof row.fieldT === 'number' ? row.fieldT : readingFieldTesla(base) };
}

export function normaliseSweep(row: SweepRow): SweepRow {
  return {
    ...row,
    walkId: orNull(row.walkId),
    analyserId: orNull(row.analyserId),
    antennaId: orNull(row.antennaId),
    vbwHz: orNull(row.vbwHz),
    attenuationDb: orNull(row.attenuationDb),
    peaks: Array.isArray(row.peaks) ? row.peaks : [],
    traceObjectKey: orNull(row.traceObjectKey),
    traceSha256: orNull(row.traceSha256),
    heightM: orNull(row.heightM),
    notes: orNull(row.notes),
    deleted: row.deleted ?? false,
  };
}

export function normaliseWalk(row: WalkRow): WalkRow {
  return { ...row, deviceLabel: orNull(row.deviceLabel), endedAt: orNull(row.endedAt), notes: orNull(row.notes), deleted: row.deleted ?? false };
}

export function normaliseOutbox(row: OutboxRow): OutboxRow {
  return { ...row, status: row.status ?? 'pending', error: row.error ?? null };
}
