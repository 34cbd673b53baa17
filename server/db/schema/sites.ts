/**
 * Where surveys happen: sites, their levels, each level's plan image (metadata only; the file lives in
 * the object store), rooms drawn on a level, the magnets (sources) and the plasma-bearing devices
 * (emitters) in them.
 *
 * Plan coordinates: every position on a level is in metres in the level's own plan frame — x to the
 * right of the image, y up the image (image rows grow downwards, so y_px = origin_y_px − y_m / m_per_px),
 * z (height) above that level's finished floor. Because positions are stored in metres, re-calibrating a
 * plan changes where they are drawn, not what they are.
 */
import { sql } from 'drizzle-orm';
import { boolean, check, doublePrecision, index, integer, jsonb, pgEnum, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import {
  ELECTRON_ENERGY_KINDS,
  EMITTER_KINDS,
  MAGNET_SHIELDINGS,
  ROOM_SENSITIVITIES,
  SOURCE_KINDS,
  SOURCE_STATES,
} from '../../../shared/schemas/vocabulary';
import { finite, sameOrg, syncConstraints, syncedOrgColumns } from './synced';

export const sourceKindEnum = pgEnum('source_kind', SOURCE_KINDS);
export const sourceStateEnum = pgEnum('source_state', SOURCE_STATES);
export const magnetShieldingEnum = pgEnum('magnet_shielding', MAGNET_SHIELDINGS);
export const emitterKindEnum = pgEnum('emitter_kind', EMITTER_KINDS);
export const electronEnergyKindEnum = pgEnum('electron_energy_kind', ELECTRON_ENERGY_KINDS);
export const roomSensitivityEnum = pgEnum('room_sensitivity', ROOM_SENSITIVITIES);

/** A vertex list [[x, y], …] in plan metres. */
export type PolygonM = [number, number][];

export const sites = pgTable(
  'sites',
  {
    ...syncedOrgColumns(),
    name: text('name').notNull(),
    address: text('address'),
    notes: text('notes'),
    /** Sites with surveys are archived, never deleted (issue 6 §1). */
    archived: boolean('archived').notNull().default(false),
  },
  (t) => [...syncConstraints('sites', t), check('sites_name_ck', sql`length(trim(${t.name})) > 0`)],
);

export const levels = pgTable(
  'levels',
  {
    ...syncedOrgColumns(),
    siteId: uuid('site_id').notNull(),
    name: text('name').notNull(),
    /** Sort order in lists, bottom floor first. */
    ordinal: integer('ordinal').notNull().default(0),
    /** Finished-floor height above the site's datum, metres; lets a magnet on one floor act on the next. */
    elevationM: doublePrecision('elevation_m').notNull().default(0),
    archived: boolean('archived').notNull().default(false),
  },
  (t) => [
    ...syncConstraints('levels', t),
    sameOrg('levels_site_fk', t.siteId, t.organisationId, sites),
    index('levels_site_idx').on(t.siteId),
    check('levels_elevation_ck', finite(t.elevationM)),
  ],
);

export const plans = pgTable(
  'plans',
  {
    ...syncedOrgColumns(),
    levelId: uuid('level_id').notNull(),
    /** Key of the image in the object store. */
    objectKey: text('object_key').notNull(),
    /** Key of the downscaled copy sent to devices, when the original is large (issue 6 §2). */
    deviceObjectKey: text('device_object_key'),
    originalName: text('original_name'),
    mime: text('mime').notNull(),
    byteSize: integer('byte_size'),
    sha256: text('sha256'),
    widthPx: integer('width_px').notNull(),
    heightPx: integer('height_px').notNull(),
    // Calibration (issue 6 §3); null until someone calibrates the plan.
    metresPerPixel: doublePrecision('metres_per_pixel'),
    /** Pixel (column, row) of the plan frame's origin (0 m, 0 m). */
    originXPx: doublePrecision('origin_x_px'),
    originYPx: doublePrecision('origin_y_px'),
    /** Direction of true north, degrees clockwise from the image's "up". */
    northAngleDeg: doublePrecision('north_angle_deg'),
  },
  (t) => [
    ...syncConstraints('plans', t),
    sameOrg('plans_level_fk', t.levelId, t.organisationId, levels),
    index('plans_level_idx').on(t.levelId),
    check('plans_size_ck', sql`${t.widthPx} > 0 AND ${t.heightPx} > 0 AND (${t.byteSize} IS NULL OR ${t.byteSize} >= 0)`),
    check('plans_mime_ck', sql`${t.mime} IN ('image/png', 'image/jpeg', 'image/webp', 'image/svg+xml')`),
    check('plans_scale_ck', sql`${t.metresPerPixel} IS NULL OR (${t.metresPerPixel} > 0 AND ${finite(t.metresPerPixel)})`),
    check('plans_north_ck', sql`${t.northAngleDeg} IS NULL OR (${t.northAngleDeg} >= 0 AND ${t.northAngleDeg} < 360)`),
    check('plans_origin_ck', sql`(${t.originXPx} IS NULL) = (${t.originYPx} IS NULL) AND ${finite(t.originXPx)} IS NOT FALSE AND ${finite(t.originYPx)} IS NOT FALSE`),
  ],
);

export const rooms = pgTable(
  'rooms',
  {
    ...syncedOrgColumns(),
    levelId: uuid('level_id').notNull(),
    name: text('name').notNull(),
    /** What the room is for ("MR scanner room", "corridor", "radio-astronomy receiver hut"). */
    use: text('use'),
    sensitivity: roomSensitivityEnum('sensitivity').notNull().default('none'),
    /** Outline in plan metres, [[x, y], …], at least three vertices, not closed (first ≠ last). */
    polygon: jsonb('polygon').$type<PolygonM>().notNull(),
  },
  (t) => [
    ...syncConstraints('rooms', t),
    sameOrg('rooms_level_fk', t.levelId, t.organisationId, levels),
    index('rooms_level_idx').on(t.levelId),
    check('rooms_polygon_ck', sql`jsonb_typeof(${t.polygon}) = 'array' AND jsonb_array_length(${t.polygon}) >= 3`),
  ],
);

export const sources = pgTable(
  'sources',
  {
    ...syncedOrgColumns(),
    siteId: uuid('site_id').notNull(),
    /** The plan the magnet is drawn on; its centre is the dipole centre (issue 6 §5). */
    levelId: uuid('level_id'),
    name: text('name').notNull(),
    kind: sourceKindEnum('kind').notNull(),
    state: sourceStateEnum('state').notNull().default('at_field'),
    shielding: magnetShieldingEnum('shielding').notNull().default('unknown'),
    /** Field at the magnet's centre, tesla (3 for a "3 T" scanner). */
    nominalFieldT: doublePrecision('nominal_field_t').notNull(),
    xM: doublePrecision('x_m'),
    yM: doublePrecision('y_m'),
    /** Height of the magnet's centre above the level's floor, metres. */
    zM: doublePrecision('z_m'),
    /** Equivalent far-field dipole moment, A·m², when known or fitted. */
    dipoleMomentAM2: doublePrecision('dipole_moment_a_m2'),
    /** Direction of the moment in the plan frame (x right, y up the plan, z up); need not be unit length. */
    axisX: doublePrecision('axis_x'),
    axisY: doublePrecision('axis_y'),
    axisZ: doublePrecision('axis_z'),
    notes: text('notes'),
  },
  (t) => [
    ...syncConstraints('sources', t),
    sameOrg('sources_site_fk', t.siteId, t.organisationId, sites),
    sameOrg('sources_level_fk', t.levelId, t.organisationId, levels),
    index('sources_site_idx').on(t.siteId),
    check('sources_field_ck', sql`${t.nominalFieldT} > 0 AND ${finite(t.nominalFieldT)}`),
    check('sources_moment_ck', sql`${t.dipoleMomentAM2} IS NULL OR (${t.dipoleMomentAM2} > 0 AND ${finite(t.dipoleMomentAM2)})`),
    check('sources_position_ck', sql`(${t.xM} IS NULL) = (${t.yM} IS NULL) AND (${t.xM} IS NULL OR ${t.levelId} IS NOT NULL)`),
    check(
      'sources_axis_ck',
      sql`(${t.axisX} IS NULL AND ${t.axisY} IS NULL AND ${t.axisZ} IS NULL) OR (${t.axisX} IS NOT NULL AND ${t.axisY} IS NOT NULL AND ${t.axisZ} IS NOT NULL AND (${t.axisX} <> 0 OR ${t.axisY} <> 0 OR ${t.axisZ} <> 0))`,
    ),
  ],
);

export const emitters = pgTable(
  'emitters',
  {
    ...syncedOrgColumns(),
    roomId: uuid('room_id').notNull(),
    name: text('name').notNull(),
    kind: emitterKindEnum('kind').notNull(),
    /** Electron density nₑ, m⁻³. */
    electronDensityPerM3: doublePrecision('electron_density_per_m3').notNull(),
    /** Mean electron kinetic energy, eV; which part of it is said by energy_kind. */
    electronEnergyEv: doublePrecision('electron_energy_ev').notNull(),
    energyKind: electronEnergyKindEnum('energy_kind').notNull(),
    /** Plasma volume, m³. */
    volumeM3: doublePrecision('volume_m3').notNull(),
    /** Position in plan metres, when known (else the room's stations stand in). */
    xM: doublePrecision('x_m'),
    yM: doublePrecision('y_m'),
    zM: doublePrecision('z_m'),
    notes: text('notes'),
  },
  (t) => [
    ...syncConstraints('emitters', t),
    sameOrg('emitters_room_fk', t.roomId, t.organisationId, rooms),
    index('emitters_room_idx').on(t.roomId),
    check(
      'emitters_plasma_ck',
      sql`${t.electronDensityPerM3} > 0 AND ${t.electronEnergyEv} > 0 AND ${t.volumeM3} > 0 AND ${finite(t.electronDensityPerM3)} AND ${finite(t.electronEnergyEv)} AND ${finite(t.volumeM3)}`,
    ),
    check('emitters_position_ck', sql`(${t.xM} IS NULL) = (${t.yM} IS NULL)`),
  ],
);
