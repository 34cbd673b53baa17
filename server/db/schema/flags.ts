/**
 * Findings the server raises (DESIGN.md §3): a predicted line inside a watch band, a station above a
 * safety line, repeat readings that disagree. Flags are recomputed idempotently (issue 8 §2): the
 * fingerprint names what a flag is about, so recomputing finds the flag it raised before instead of
 * raising a second one.
 */
import { sql } from 'drizzle-orm';
import { check, doublePrecision, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { FLAG_KINDS, FLAG_STATES } from '../../../shared/schemas/vocabulary';
import { severityEnum, watchBands } from './bands';
import { users } from './organisations';
import { rooms } from './sites';
import { speciesEnum, stations, surveys } from './surveys';
import { sameOrg, syncConstraints, syncedOrgColumns } from './synced';

export const flagKindEnum = pgEnum('flag_kind', FLAG_KINDS);
export const flagStateEnum = pgEnum('flag_state', FLAG_STATES);

export const flags = pgTable(
  'flags',
  {
    ...syncedOrgColumns(),
    surveyId: uuid('survey_id').notNull(),
    kind: flagKindEnum('kind').notNull(),
    state: flagStateEnum('state').notNull().default('open'),
    severity: severityEnum('severity').notNull(),
    /** Stable key of what the flag is about, e.g. "line_in_band:<room>:<band>:electron:2". */
    fingerprint: text('fingerprint').notNull(),
    roomId: uuid('room_id'),
    stationId: uuid('station_id'),
    watchBandId: uuid('watch_band_id'),
    species: speciesEnum('species'),
    harmonic: integer('harmonic'),
    /** For line_in_band: the overlap of the predicted band with the watch band, Hz. */
    overlapLowerHz: doublePrecision('overlap_lower_hz'),
    overlapUpperHz: doublePrecision('overlap_upper_hz'),
    /** Computed numbers behind the flag (field interval, emitted power, flux density…), with units in the keys. */
    details: jsonb('details').$type<Record<string, unknown>>().notNull().default(sql`'{}'::jsonb`),
    acknowledgedAt: timestamp('acknowledged_at', { withTimezone: true }),
    acknowledgedByUserId: uuid('acknowledged_by_user_id').references(() => users.id),
    acknowledgementNote: text('acknowledgement_note'),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
    resolvedByUserId: uuid('resolved_by_user_id').references(() => users.id),
    /** The action taken: lamp replaced, gauge moved, shielding added. */
    resolution: text('resolution'),
  },
  (t) => [
    ...syncConstraints('flags', t),
    sameOrg('flags_survey_fk', t.surveyId, t.organisationId, surveys),
    sameOrg('flags_room_fk', t.roomId, t.organisationId, rooms),
    sameOrg('flags_station_fk', t.stationId, t.organisationId, stations),
    sameOrg('flags_watch_band_fk', t.watchBandId, t.organisationId, watchBands),
    uniqueIndex('flags_fingerprint_uq').on(t.surveyId, t.fingerprint).where(sql`${t.deleted} = false`),
    index('flags_survey_state_idx').on(t.surveyId, t.state),
    check('flags_harmonic_ck', sql`${t.harmonic} IS NULL OR ${t.harmonic} >= 1`),
    check(
      'flags_overlap_ck',
      sql`(${t.overlapLowerHz} IS NULL AND ${t.overlapUpperHz} IS NULL) OR (${t.overlapLowerHz} >= 0 AND ${t.overlapLowerHz} <= ${t.overlapUpperHz})`,
    ),
    check('flags_line_ck', sql`${t.kind} <> 'line_in_band' OR (${t.watchBandId} IS NOT NULL AND ${t.species} IS NOT NULL AND ${t.harmonic} IS NOT NULL)`),
    check(
      'flags_state_ck',
      sql`(${t.state} = 'open') OR (${t.state} = 'acknowledged' AND ${t.acknowledgedAt} IS NOT NULL AND ${t.acknowledgedByUserId} IS NOT NULL AND length(trim(coalesce(${t.acknowledgementNote}, ''))) > 0) OR (${t.state} = 'resolved' AND ${t.resolvedAt} IS NOT NULL AND ${t.resolvedByUserId} IS NOT NULL AND length(trim(coalesce(${t.resolution}, ''))) > 0)`,
    ),
  ],
);
