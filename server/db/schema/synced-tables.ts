/**
 * Every table devices sync, by SQL table name — the `entity` written into change_log. Pull and push
 * look tables up here; a synced table missing from this list fails tests/server/schema.test.ts.
 */
import { zoneSets, watchBands } from './bands';
import { flags } from './flags';
import { instruments } from './instruments';
import { emitters, levels, plans, rooms, sites, sources } from './sites';
import { decisions, fieldReadings, stations, surveyAssignments, surveys, sweeps, walks } from './surveys';

export const syncedTables = {
  sites,
  levels,
  plans,
  rooms,
  sources,
  emitters,
  instruments,
  watch_bands: watchBands,
  zone_sets: zoneSets,
  surveys,
  survey_assignments: surveyAssignments,
  walks,
  stations,
  field_readings: fieldReadings,
  sweeps,
  decisions,
  flags,
} as const;

export type SyncedEntity = keyof typeof syncedTables;
export const SYNCED_ENTITIES = Object.keys(syncedTables) as SyncedEntity[];
