/**
 * Reads behind the survey map, and its cache (server/db/schema/maps.ts). Every query is scoped by
 * organisation. The map's inputs are read in one repeatable-read snapshot together with their data
 * version, so a stored map always matches the version it is stored under.
 *
 * Bulk rows (stations, readings) are read with plain SQL and few columns: a survey of 100,000 readings
 * must load in tens of milliseconds.
 */
import { and, desc, eq, notInArray, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { sites, surveyAssignments, surveyMapCache, surveys, zoneSets } from '../../db/schema';

/** Stored maps kept per survey (the newest variants); more would only grow with every ad-hoc level someone tries. */
const VARIANTS_KEPT_PER_SURVEY = 8;

export interface MapSurveyRow {
  id: string;
  organisationId: string;
  siteId: string;
  siteName: string;
  name: string;
  state: 'open' | 'submitted' | 'signed_off';
  zoneSetId: string | null;
  levelIds: string[];
  repeatRadiusM: number;
  signedOffAt: Date | null;
}

export interface MapInputs {
  dataVersion: number;
  zoneSet: { id: string; name: string; edition: string; thresholds: { name: string; fieldT: number; caution: string }[] } | null;
  levels: { id: string; name: string; ordinal: number; elevation_m: number }[];
  plans: {
    id: string;
    level_id: string;
    original_name: string | null;
    width_px: number;
    height_px: number;
    metres_per_pixel: number | null;
    origin_x_px: number | null;
    origin_y_px: number | null;
    north_angle_deg: number | null;
  }[];
  rooms: { id: string; level_id: string; name: string; use: string | null; sensitivity: string; polygon: [number, number][] }[];
  sources: { id: string; level_id: string; name: string; kind: string; nominal_field_t: number; x_m: number; y_m: number; z_m: number | null }[];
  stations: { id: string; level_id: string; room_id: string | null; label: string | null; x_m: number; y_m: number }[];
  /** Live readings with a positive |B|, oldest first by the device clock (the best "latest" there is). */
  readings: { id: string; station_id: string; height_m: number; field_t: number; instrument_id: string | null }[];
  /** The verdict of the latest live decision per reading (by change sequence). */
  verdicts: Map<string, string>;
  uncertainties: Map<string, number | null>;
  /** Live repeat_disagreement flags: fingerprint → id. */
  repeatFlags: Map<string, string>;
}

export function createSurveyMapRepository(db: Db) {
  /** Highest change sequence of everything a survey map is made from (tombstones included: a deletion is a change). */
  async function dataVersion(tx: DbOrTx, organisationId: string, surveyId: string, siteId: string): Promise<number> {
    const org = sql`${organisationId}::uuid`;
    const survey = sql`${surveyId}::uuid`;
    const site = sql`${siteId}::uuid`;
    const res = await tx.execute<{ v: string | null }>(sql`
      SELECT GREATEST(
        (SELECT change_seq FROM surveys WHERE organisation_id = ${org} AND id = ${survey}),
        (SELECT max(change_seq) FROM stations WHERE organisation_id = ${org} AND survey_id = ${survey}),
        (SELECT max(change_seq) FROM field_readings WHERE organisation_id = ${org} AND survey_id = ${survey}),
        (SELECT max(change_seq) FROM decisions WHERE organisation_id = ${org} AND survey_id = ${survey}),
        (SELECT max(change_seq) FROM flags WHERE organisation_id = ${org} AND survey_id = ${survey}),
        (SELECT max(z.change_seq) FROM zone_sets z JOIN surveys s ON s.zone_set_id = z.id WHERE s.id = ${survey} AND z.organisation_id = ${org}),
        (SELECT change_seq FROM sites WHERE organisation_id = ${org} AND id = ${site}),
        (SELECT max(change_seq) FROM levels WHERE organisation_id = ${org} AND site_id = ${site}),
        (SELECT max(p.change_seq) FROM plans p JOIN levels l ON l.id = p.level_id WHERE l.site_id = ${site} AND p.organisation_id = ${org}),
        (SELECT max(r.change_seq) FROM rooms r JOIN levels l ON l.id = r.level_id WHERE l.site_id = ${site} AND r.organisation_id = ${org}),
        (SELECT max(change_seq) FROM sources WHERE organisation_id = ${org} AND site_id = ${site}),
        (SELECT max(change_seq) FROM instruments WHERE organisation_id = ${org})
      ) AS v`);
    return Number(res.rows[0]?.v ?? 0);
  }

  return {
    async findSurvey(organisationId: string, surveyId: string): Promise<MapSurveyRow | null> {
      const [row] = await db
        .select({
          id: surveys.id,
          organisationId: surveys.organisationId,
          siteId: surveys.siteId,
          siteName: sites.name,
          name: surveys.name,
          state: surveys.state,
          zoneSetId: surveys.zoneSetId,
          levelIds: surveys.levelIds,
          repeatRadiusM: surveys.repeatRadiusM,
          signedOffAt: surveys.signedOffAt,
        })
        .from(surveys)
        .innerJoin(sites, eq(sites.id, surveys.siteId))
        .where(and(eq(surveys.organisationId, organisationId), eq(surveys.id, surveyId), eq(surveys.deleted, false)))
        .limit(1);
      return row ?? null;
    },

    async isAssignedSurveyor(organisationId: string, surveyId: string, userId: string): Promise<boolean> {
      const [row] = await db
        .select({ id: surveyAssignments.id })
        .from(surveyAssignments)
        .where(
          and(
            eq(surveyAssignments.organisationId, organisationId),
            eq(surveyAssignments.surveyId, surveyId),
            eq(surveyAssignments.userId, userId),
            eq(surveyAssignments.role, 'surveyor'),
            eq(surveyAssignments.deleted, false),
          ),
        )
        .limit(1);
      return Boolean(row);
    },

    dataVersion: (organisationId: string, surveyId: string, siteId: string) => dataVersion(db, organisationId, surveyId, siteId),

    async cached(surveyId: string, variant: string): Promise<{ dataVersion: number; payload: string } | null> {
      const [row] = await db
        .select({ dataVersion: surveyMapCache.dataVersion, payload: surveyMapCache.payload })
        .from(surveyMapCache)
        .where(and(eq(surveyMapCache.surveyId, surveyId), eq(surveyMapCache.variant, variant)))
        .limit(1);
      return row ?? null;
    },

    /** Stores a computed map (the newer data version wins a race) and drops the survey's oldest variants. */
    async store(entry: { surveyId: string; organisationId: string; variant: string; dataVersion: number; payload: string; computeMs: number }): Promise<void> {
      await db
        .insert(surveyMapCache)
        .values(entry)
        .onConflictDoUpdate({
          target: [surveyMapCache.surveyId, surveyMapCache.variant],
          set: { dataVersion: entry.dataVersion, payload: entry.payload, computeMs: entry.computeMs, computedAt: sql`now()` },
          setWhere: sql`${surveyMapCache.dataVersion} <= ${entry.dataVersion}`,
        });
      const keep = db
        .select({ variant: surveyMapCache.variant })
        .from(surveyMapCache)
        .where(eq(surveyMapCache.surveyId, entry.surveyId))
        .orderBy(desc(surveyMapCache.computedAt))
        .limit(VARIANTS_KEPT_PER_SURVEY);
      await db.delete(surveyMapCache).where(and(eq(surveyMapCache.surveyId, entry.surveyId), notInArray(surveyMapCache.variant, keep)));
    },

    /** Everything the map is computed from, with its data version, in one snapshot. */
    async loadInputs(survey: MapSurveyRow): Promise<MapInputs> {
      return db.transaction(
        async (tx) => {
          const org = sql`${survey.organisationId}::uuid`;
          const sv = sql`${survey.id}::uuid`;
          const site = sql`${survey.siteId}::uuid`;
          const version = await dataVersion(tx, survey.organisationId, survey.id, survey.siteId);
          const [zoneSet] = survey.zoneSetId
            ? await tx
                .select({ id: zoneSets.id, name: zoneSets.name, edition: zoneSets.edition, thresholds: zoneSets.thresholds })
                .from(zoneSets)
                .where(and(eq(zoneSets.organisationId, survey.organisationId), eq(zoneSets.id, survey.zoneSetId), eq(zoneSets.deleted, false)))
                .limit(1)
            : [];
          const levels = await tx.execute<MapInputs['levels'][number]>(
            sql`SELECT id, name, ordinal, elevation_m FROM levels WHERE organisation_id = ${org} AND site_id = ${site} AND NOT deleted ORDER BY ordinal, name`,
          );
          // The newest live plan of each level.
          const plans = await tx.execute<MapInputs['plans'][number]>(sql`
            SELECT DISTINCT ON (p.level_id) p.id, p.level_id, p.original_name, p.width_px, p.height_px, p.metres_per_pixel, p.origin_x_px, p.origin_y_px, p.north_angle_deg
            FROM plans p JOIN levels l ON l.id = p.level_id
            WHERE p.organisation_id = ${org} AND l.site_id = ${site} AND NOT p.deleted
            ORDER BY p.level_id, p.created_at DESC, p.id DESC`);
          const rooms = await tx.execute<MapInputs['rooms'][number]>(sql`
            SELECT r.id, r.level_id, r.name, r.use, r.sensitivity::text AS sensitivity, r.polygon
            FROM rooms r JOIN levels l ON l.id = r.level_id
            WHERE r.organisation_id = ${org} AND l.site_id = ${site} AND NOT r.deleted ORDER BY r.name, r.id`);
          const sources = await tx.execute<MapInputs['sources'][number]>(sql`
            SELECT id, level_id, name, kind::text AS kind, nominal_field_t, x_m, y_m, z_m FROM sources
            WHERE organisation_id = ${org} AND site_id = ${site} AND NOT deleted AND level_id IS NOT NULL AND x_m IS NOT NULL ORDER BY name, id`);
          const stations = await tx.execute<MapInputs['stations'][number]>(
            sql`SELECT id, level_id, room_id, label, x_m, y_m FROM stations WHERE organisation_id = ${org} AND survey_id = ${sv} AND NOT deleted ORDER BY id`,
          );
          const readings = await tx.execute<MapInputs['readings'][number]>(sql`
            SELECT id, station_id, height_m, field_t, instrument_id FROM field_readings
            WHERE organisation_id = ${org} AND survey_id = ${sv} AND NOT deleted AND field_t > 0 ORDER BY measured_at, id`);
          const verdicts = await tx.execute<{ id: string; verdict: string }>(sql`
            SELECT DISTINCT ON (field_reading_id) field_reading_id AS id, verdict::text AS verdict FROM decisions
            WHERE organisation_id = ${org} AND survey_id = ${sv} AND NOT deleted AND field_reading_id IS NOT NULL
            ORDER BY field_reading_id, change_seq DESC`);
          const instruments = await tx.execute<{ id: string; relative_uncertainty: number | null }>(
            sql`SELECT id, relative_uncertainty FROM instruments WHERE organisation_id = ${org}`,
          );
          const flags = await tx.execute<{ id: string; fingerprint: string }>(sql`
            SELECT id, fingerprint FROM flags WHERE organisation_id = ${org} AND survey_id = ${sv} AND kind = 'repeat_disagreement' AND NOT deleted`);
          return {
            dataVersion: version,
            zoneSet: zoneSet ?? null,
            levels: levels.rows,
            plans: plans.rows,
            rooms: rooms.rows,
            sources: sources.rows,
            stations: stations.rows,
            readings: readings.rows,
            verdicts: new Map(verdicts.rows.map((r) => [r.id, r.verdict])),
            uncertainties: new Map(instruments.rows.map((r) => [r.id, r.relative_uncertainty])),
            repeatFlags: new Map(flags.rows.map((r) => [r.fingerprint, r.id])),
          };
        },
        { isolationLevel: 'repeatable read', accessMode: 'read only' },
      );
    },
  };
}
export type SurveyMapRepository = ReturnType<typeof createSurveyMapRepository>;
