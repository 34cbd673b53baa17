import type { Table } from 'dexie';
import type { CaptureEntity } from '@shared/schemas/capture';
import type { FringewalkDb } from '@/db';

type CapturedRow = { id: string; surveyId: string; revision: number; deleted: boolean } & Record<string, unknown>;

/** The device table that holds each pushed entity. */
export function capturedTable(db: FringewalkDb, entity: CaptureEntity): Table<CapturedRow, string> {
  const tables = { walks: db.walks, stations: db.stations, field_readings: db.fieldReadings, sweeps: db.sweeps } as const;
  return tables[entity] as unknown as Table<CapturedRow, string>;
}

export const capturedTables = (db: FringewalkDb) => [db.walks, db.stations, db.fieldReadings, db.sweeps];
