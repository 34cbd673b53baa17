/**
 * Survey campaigns and what is captured in them: who is assigned, each surveyor's walks, the stations
 * they mark on a plan, the field readings and spectrum sweeps taken there, and the reviewers' decisions.
 *
 * Readings and sweeps are facts (DESIGN.md §4): they are corrected by a new revision or a tombstone,
 * never merged field by field. Device clocks are recorded (measured_at) but never used for ordering;
 * change_seq is.
 */
import { sql } from 'drizzle-orm';
import {
  boolean,
  check,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { SURVEY_STATES } from '../../../shared/schemas/home';
import {
  ASSIGNMENT_ROLES,
  DETECTORS,
  FIELD_UNITS,
  PROBE_ORIENTATIONS,
  SPECIES,
  VERDICTS,
} from '../../../shared/schemas/vocabulary';
import { zoneSets } from './bands';
import { instruments } from './instruments';
import { users } from './organisations';
import { levels, rooms, sites } from './sites';
import { finite, sameOrg, syncConstraints, syncedOrgColumns } from './synced';

export const surveyStateEnum = pgEnum('survey_state', SURVEY_STATES);
export const assignmentRoleEnum = pgEnum('assignment_role', ASSIGNMENT_ROLES);
export const speciesEnum = pgEnum('species', SPECIES);
export const fieldUnitEnum = pgEnum('field_unit', FIELD_UNITS);
export const probeOrientationEnum = pgEnum('probe_orientation', PROBE_ORIENTATIONS);
export const detectorEnum = pgEnum('detector', DETECTORS);
export const verdictEnum = pgEnum('verdict', VERDICTS);

/** A peak marker read off the analyser. */
export interface PeakMarker {
  frequencyHz: number;
  levelDbm: number;
}

const userRef = (name: string) => uuid(name).references(() => users.id);

export const surveys = pgTable(
  'surveys',
  {
    ...syncedOrgColumns(),
    siteId: uuid('site_id').notNull(),
    name: text('name').notNull(),
    state: surveyStateEnum('state').notNull().default('open'),
    zoneSetId: uuid('zone_set_id'),
    /**
     * The levels of the site this survey walks (issue 6 §8). Checked against the site's levels by the
     * service (an array cannot carry a foreign key); the offline bundle sends only these levels.
     */
    levelIds: uuid('level_ids').array().notNull().default(sql`'{}'::uuid[]`),
    startsOn: date('starts_on', { mode: 'string' }),
    endsOn: date('ends_on', { mode: 'string' }),
    /** Species whose cyclotron lines are predicted for this survey. */
    species: speciesEnum('species').array().notNull().default(sql`'{electron,proton}'::species[]`),
    /** Harmonics n = 1 … max_harmonic are predicted. */
    maxHarmonic: integer('max_harmonic').notNull().default(3),
    /** Readings at stations closer than this are grouped as repeats (issue 5 §4). */
    repeatRadiusM: doublePrecision('repeat_radius_m').notNull().default(0.3),
    notes: text('notes'),
    submittedAt: timestamp('submitted_at', { withTimezone: true }),
    submittedByUserId: userRef('submitted_by_user_id'),
    signedOffAt: timestamp('signed_off_at', { withTimezone: true }),
    signedOffByUserId: userRef('signed_off_by_user_id'),
    /** SHA-256 of the report's data at sign-off (issue 7 §4 defines what is hashed). */
    reportSha256: text('report_sha256'),
  },
  (t) => [
    ...syncConstraints('surveys', t),
    sameOrg('surveys_site_fk', t.siteId, t.organisationId, sites),
    sameOrg('surveys_zone_set_fk', t.zoneSetId, t.organisationId, zoneSets),
    index('surveys_site_idx').on(t.siteId),
    check('surveys_harmonic_ck', sql`${t.maxHarmonic} BETWEEN 1 AND 50`),
    check('surveys_radius_ck', sql`${t.repeatRadiusM} > 0 AND ${finite(t.repeatRadiusM)}`),
    check('surveys_dates_ck', sql`${t.startsOn} IS NULL OR ${t.endsOn} IS NULL OR ${t.startsOn} <= ${t.endsOn}`),
    check('surveys_species_ck', sql`cardinality(${t.species}) >= 1`),
    check(
      'surveys_state_ck',
      sql`(${t.state} = 'open') OR (${t.submittedAt} IS NOT NULL AND ${t.submittedByUserId} IS NOT NULL AND (${t.state} <> 'signed_off' OR (${t.signedOffAt} IS NOT NULL AND ${t.signedOffByUserId} IS NOT NULL)))`,
    ),
  ],
);

export const surveyAssignments = pgTable(
  'survey_assignments',
  {
    ...syncedOrgColumns(),
    surveyId: uuid('survey_id').notNull(),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id),
    role: assignmentRoleEnum('role').notNull(),
  },
  (t) => [
    ...syncConstraints('survey_assignments', t),
    sameOrg('survey_assignments_survey_fk', t.surveyId, t.organisationId, surveys),
    uniqueIndex('survey_assignments_uq').on(t.surveyId, t.userId, t.role).where(sql`${t.deleted} = false`),
    index('survey_assignments_user_idx').on(t.userId),
  ],
);

export const walks = pgTable(
  'walks',
  {
    ...syncedOrgColumns(),
    surveyId: uuid('survey_id').notNull(),
    surveyorUserId: userRef('surveyor_user_id').notNull(),
    /** The device's own id (made once per install) and a label the surveyor recognises. */
    deviceId: text('device_id').notNull(),
    deviceLabel: text('device_label'),
    /** Device clock: recorded, never used for ordering. */
    startedAt: timestamp('started_at', { withTimezone: true }).notNull(),
    endedAt: timestamp('ended_at', { withTimezone: true }),
    notes: text('notes'),
  },
  (t) => [
    ...syncConstraints('walks', t),
    sameOrg('walks_survey_fk', t.surveyId, t.organisationId, surveys),
    index('walks_survey_idx').on(t.surveyId),
    check('walks_times_ck', sql`${t.endedAt} IS NULL OR ${t.startedAt} <= ${t.endedAt}`),
  ],
);

export const stations = pgTable(
  'stations',
  {
    ...syncedOrgColumns(),
    surveyId: uuid('survey_id').notNull(),
    levelId: uuid('level_id').notNull(),
    /** The walk that placed it; stations outlive walks and are reused by later ones. */
    walkId: uuid('walk_id'),
    /** The room containing (x, y), found from the room polygons; null outside every room. */
    roomId: uuid('room_id'),
    label: text('label'),
    xM: doublePrecision('x_m').notNull(),
    yM: doublePrecision('y_m').notNull(),
    /** Height above the level's floor, metres. */
    heightM: doublePrecision('height_m').notNull().default(1),
    createdByUserId: userRef('created_by_user_id'),
    notes: text('notes'),
  },
  (t) => [
    ...syncConstraints('stations', t),
    sameOrg('stations_survey_fk', t.surveyId, t.organisationId, surveys),
    sameOrg('stations_level_fk', t.levelId, t.organisationId, levels),
    sameOrg('stations_walk_fk', t.walkId, t.organisationId, walks),
    sameOrg('stations_room_fk', t.roomId, t.organisationId, rooms),
    index('stations_survey_idx').on(t.surveyId, t.levelId),
    index('stations_room_idx').on(t.roomId),
    check('stations_position_ck', sql`${finite(t.xM)} AND ${finite(t.yM)} AND ${finite(t.heightM)} AND ${t.heightM} >= 0`),
  ],
);

export const fieldReadings = pgTable(
  'field_readings',
  {
    ...syncedOrgColumns(),
    /** Denormalised from the station so survey-wide queries and permission checks need no join. */
    surveyId: uuid('survey_id').notNull(),
    stationId: uuid('station_id').notNull(),
    walkId: uuid('walk_id'),
    instrumentId: uuid('instrument_id'),
    surveyorUserId: userRef('surveyor_user_id').notNull(),
    /** |B| in tesla as read off a single-value meter; null when the components were read instead. */
    magnitudeT: doublePrecision('magnitude_t'),
    /** Field components in tesla in the probe's frame; all three or none. */
    bxT: doublePrecision('bx_t'),
    byT: doublePrecision('by_t'),
    bzT: doublePrecision('bz_t'),
    /**
     * |B| in tesla whichever way it was entered, for maps and classes. Never null in practice (the
     * value check guarantees an input), but not declared NOT NULL: PostgreSQL tests NOT NULL before
     * CHECK, and the named check gives the clearer refusal.
     */
    fieldT: doublePrecision('field_t').generatedAlwaysAs(sql`coalesce(magnitude_t, sqrt(bx_t * bx_t + by_t * by_t + bz_t * bz_t))`),
    /** The unit the surveyor typed; the stored values are tesla regardless. */
    unit: fieldUnitEnum('unit').notNull(),
    probeOrientation: probeOrientationEnum('probe_orientation').notNull(),
    /** Probe height above the floor, metres. */
    heightM: doublePrecision('height_m').notNull(),
    /** Background (e.g. Earth's field) noted at the time, tesla; whether the meter was zeroed first. */
    backgroundT: doublePrecision('background_t'),
    zeroed: boolean('zeroed').notNull().default(false),
    /** Device clock at the reading: recorded, never used for ordering. */
    measuredAt: timestamp('measured_at', { withTimezone: true }).notNull(),
    notes: text('notes'),
    photoObjectKey: text('photo_object_key'),
    photoSha256: text('photo_sha256'),
  },
  (t) => [
    ...syncConstraints('field_readings', t),
    sameOrg('field_readings_survey_fk', t.surveyId, t.organisationId, surveys),
    sameOrg('field_readings_station_fk', t.stationId, t.organisationId, stations),
    sameOrg('field_readings_walk_fk', t.walkId, t.organisationId, walks),
    sameOrg('field_readings_instrument_fk', t.instrumentId, t.organisationId, instruments),
    index('field_readings_survey_idx').on(t.surveyId),
    index('field_readings_station_idx').on(t.stationId),
    index('field_readings_walk_idx').on(t.walkId),
    check('field_readings_magnitude_ck', sql`${t.magnitudeT} IS NULL OR (${t.magnitudeT} >= 0 AND ${finite(t.magnitudeT)})`),
    check(
      'field_readings_value_ck',
      sql`(${t.magnitudeT} IS NOT NULL AND ${t.bxT} IS NULL AND ${t.byT} IS NULL AND ${t.bzT} IS NULL) OR (${t.magnitudeT} IS NULL AND ${t.bxT} IS NOT NULL AND ${t.byT} IS NOT NULL AND ${t.bzT} IS NOT NULL AND ${finite(t.bxT)} AND ${finite(t.byT)} AND ${finite(t.bzT)})`,
    ),
    check('field_readings_height_ck', sql`${t.heightM} >= 0 AND ${finite(t.heightM)}`),
    check('field_readings_background_ck', sql`${t.backgroundT} IS NULL OR (${t.backgroundT} >= 0 AND ${finite(t.backgroundT)})`),
  ],
);

export const sweeps = pgTable(
  'sweeps',
  {
    ...syncedOrgColumns(),
    surveyId: uuid('survey_id').notNull(),
    stationId: uuid('station_id').notNull(),
    walkId: uuid('walk_id'),
    analyserId: uuid('analyser_id'),
    antennaId: uuid('antenna_id'),
    surveyorUserId: userRef('surveyor_user_id').notNull(),
    measuredAt: timestamp('measured_at', { withTimezone: true }).notNull(),
    startHz: doublePrecision('start_hz').notNull(),
    stopHz: doublePrecision('stop_hz').notNull(),
    rbwHz: doublePrecision('rbw_hz').notNull(),
    vbwHz: doublePrecision('vbw_hz'),
    referenceLevelDbm: doublePrecision('reference_level_dbm').notNull(),
    attenuationDb: doublePrecision('attenuation_db'),
    detector: detectorEnum('detector').notNull(),
    peaks: jsonb('peaks').$type<PeakMarker[]>().notNull().default(sql`'[]'::jsonb`),
    /** The optional trace file (CSV of frequency and level) in the object store. */
    traceObjectKey: text('trace_object_key'),
    traceSha256: text('trace_sha256'),
    heightM: doublePrecision('height_m'),
    notes: text('notes'),
  },
  (t) => [
    ...syncConstraints('sweeps', t),
    sameOrg('sweeps_survey_fk', t.surveyId, t.organisationId, surveys),
    sameOrg('sweeps_station_fk', t.stationId, t.organisationId, stations),
    sameOrg('sweeps_walk_fk', t.walkId, t.organisationId, walks),
    sameOrg('sweeps_analyser_fk', t.analyserId, t.organisationId, instruments),
    sameOrg('sweeps_antenna_fk', t.antennaId, t.organisationId, instruments),
    index('sweeps_survey_idx').on(t.surveyId),
    index('sweeps_station_idx').on(t.stationId),
    check('sweeps_span_ck', sql`${t.startHz} >= 0 AND ${t.startHz} < ${t.stopHz} AND ${finite(t.stopHz)}`),
    check('sweeps_rbw_ck', sql`${t.rbwHz} > 0 AND ${finite(t.rbwHz)} AND (${t.vbwHz} IS NULL OR ${t.vbwHz} > 0)`),
    check('sweeps_reference_ck', finite(t.referenceLevelDbm)),
    check('sweeps_peaks_ck', sql`jsonb_typeof(${t.peaks}) = 'array'`),
  ],
);

export const decisions = pgTable(
  'decisions',
  {
    ...syncedOrgColumns(),
    surveyId: uuid('survey_id').notNull(),
    /** Exactly one of the two: the verdict is on a field reading or on a sweep. */
    fieldReadingId: uuid('field_reading_id'),
    sweepId: uuid('sweep_id'),
    verdict: verdictEnum('verdict').notNull(),
    /** Required for `remeasure` (what to do) and `rejected` (why). */
    note: text('note'),
    reviewerUserId: userRef('reviewer_user_id').notNull(),
    decidedAt: timestamp('decided_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    ...syncConstraints('decisions', t),
    sameOrg('decisions_survey_fk', t.surveyId, t.organisationId, surveys),
    sameOrg('decisions_reading_fk', t.fieldReadingId, t.organisationId, fieldReadings),
    sameOrg('decisions_sweep_fk', t.sweepId, t.organisationId, sweeps),
    index('decisions_survey_idx').on(t.surveyId),
    index('decisions_reading_idx').on(t.fieldReadingId),
    index('decisions_sweep_idx').on(t.sweepId),
    check('decisions_target_ck', sql`(${t.fieldReadingId} IS NULL) <> (${t.sweepId} IS NULL)`),
    check('decisions_note_ck', sql`${t.verdict} = 'accepted' OR length(trim(coalesce(${t.note}, ''))) > 0`),
  ],
);
