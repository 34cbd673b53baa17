/**
 * Survey maps (issue 7 §1), comparison with an earlier signed-off survey (§2) and the GeoJSON export
 * (§6). Maps are computed here, on the server, and stored per survey and variant with the data version
 * they were made from (server/db/schema/maps.ts): a request whose data version matches gets the stored
 * answer as it is; any write to what the map reads takes a new change sequence and so a new version.
 *
 * Who may look: admins, reviewers and EMC engineers of the organisation, and surveyors assigned to the
 * survey (403 NOT_ASSIGNED otherwise). Viewers, and everyone outside the organisation, may not.
 */
import { GENERAL_SAFETY_CAUTIONS } from '../../../shared/physics';
import { rayContourCrossing } from '../../../shared/maps/level-map';
import type { Role } from '../../../shared/schemas/common';
import {
  DEFAULT_COMPARE_BEARINGS_DEG,
  type CompareLevel,
  type LevelMap,
  type SurveyCompare,
  type SurveyCompareQuery,
  type SurveyMap,
  type SurveyMapQuery,
} from '../../../shared/schemas/survey-map';
import { AppError, notFound } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import { computeSurveyMap } from './survey-map.compute';
import type { MapSurveyRow, SurveyMapRepository } from './survey-map.repository';

/** Bump when the computation changes: stored maps of an older computation are then recomputed. */
export const MAP_COMPUTATION_VERSION = 2;

export interface Caller {
  userId: string;
  role: Role;
}

/** A crossing this close to the surveyed area's edge (in grid cells) is the line closing along the edge. */
const EDGE_TOLERANCE_CELLS = 1.5;

export function createSurveyMapService(deps: { repo: SurveyMapRepository; logger: Logger }) {
  const { repo, logger } = deps;
  const inFlight = new Map<string, Promise<{ payload: string; dataVersion: number; storing: Promise<void> }>>();

  async function surveyFor(organisationId: string, surveyId: string, caller: Caller): Promise<MapSurveyRow> {
    const survey = await repo.findSurvey(organisationId, surveyId);
    if (!survey) throw notFound('That survey');
    if (caller.role === 'surveyor' && !(await repo.isAssignedSurveyor(organisationId, surveyId, caller.userId))) {
      throw new AppError('NOT_ASSIGNED', 'Only surveyors assigned to this survey may see its map.');
    }
    return survey;
  }

  const variantOf = (extraLevelsT: readonly number[]) => `v${MAP_COMPUTATION_VERSION}|levels=${[...new Set(extraLevelsT)].sort((a, b) => a - b).join(',')}`;

  /** The stored map when its version is current, else a fresh one (stored as it is returned). */
  async function mapPayload(survey: MapSurveyRow, extraLevelsT: readonly number[]): Promise<{ payload: string; dataVersion: number; cache: 'hit' | 'miss' }> {
    const variant = variantOf(extraLevelsT);
    const [version, stored] = await Promise.all([repo.dataVersion(survey.organisationId, survey.id, survey.siteId), repo.cached(survey.id, variant)]);
    if (stored && stored.dataVersion === version) return { payload: stored.payload, dataVersion: version, cache: 'hit' };
    const key = `${survey.id}|${variant}|${version}`;
    const joined = inFlight.get(key);
    if (joined) {
      // Someone else is computing this very map: take theirs once it is stored.
      const result = await joined;
      await result.storing;
      return { payload: result.payload, dataVersion: result.dataVersion, cache: 'hit' };
    }
    const job = (async () => {
      const started = performance.now();
      const inputs = await repo.loadInputs(survey);
      const map = computeSurveyMap(survey, inputs, extraLevelsT, new Date());
      const payload = JSON.stringify(map);
      const computeMs = Math.round(performance.now() - started);
      logger.debug({ surveyId: survey.id, variant, computeMs, bytes: payload.length }, 'survey map computed');
      // Stored while the answer is on its way: the caller does not wait for the write. A failed write
      // only costs the next request a recomputation.
      const storing = repo
        .store({ surveyId: survey.id, organisationId: survey.organisationId, variant, dataVersion: inputs.dataVersion, payload, computeMs })
        .catch((error: unknown) => logger.error({ err: error, surveyId: survey.id }, 'survey map could not be stored'));
      return { payload, dataVersion: inputs.dataVersion, storing };
    })();
    inFlight.set(key, job);
    job
      .then((r) => r.storing)
      .finally(() => inFlight.delete(key))
      .catch(() => undefined);
    const result = await job;
    return { payload: result.payload, dataVersion: result.dataVersion, cache: 'miss' };
  }

  async function mapObject(survey: MapSurveyRow, extraLevelsT: readonly number[]): Promise<SurveyMap> {
    return JSON.parse((await mapPayload(survey, extraLevelsT)).payload) as SurveyMap;
  }

  return {
    /** GET …/map: the JSON text (stored or fresh) and whether it came from the store. */
    async map(organisationId: string, surveyId: string, caller: Caller, query: SurveyMapQuery) {
      const survey = await surveyFor(organisationId, surveyId, caller);
      return mapPayload(survey, query.levels ?? []);
    },

    /** GET …/compare?with=: where each line of this survey moved since an earlier signed-off survey of the same site. */
    async compare(organisationId: string, surveyId: string, caller: Caller, query: SurveyCompareQuery): Promise<SurveyCompare> {
      if (query.with === surveyId) throw new AppError('BAD_REQUEST', 'Pick another survey to compare with.');
      const current = await surveyFor(organisationId, surveyId, caller);
      const earlier = await surveyFor(organisationId, query.with, caller);
      if (earlier.siteId !== current.siteId) throw new AppError('BAD_REQUEST', 'Surveys compare only with surveys of the same site.');
      if (earlier.state !== 'signed_off') throw new AppError('BAD_REQUEST', 'Compare with a signed-off survey: its lines are final.');

      const currentMap = await mapObject(current, query.levels ?? []);
      const levelsT = [...currentMap.zoneSet.thresholds.map((t) => t.fieldT), ...currentMap.extraLevelsT].sort((a, b) => a - b);
      // The earlier survey is contoured at THIS survey's lines, so the same line is compared.
      const earlierMap = await mapObject(earlier, levelsT);
      const bearings = [...new Set(query.bearings ?? DEFAULT_COMPARE_BEARINGS_DEG)].sort((a, b) => a - b);
      const labelOf = (levelT: number) => currentMap.zoneSet.thresholds.find((t) => t.fieldT === levelT)?.name ?? 'Added level';
      const pick = (level: LevelMap | undefined, levelT: number) => level?.contours.find((c) => c.levelT === levelT) ?? null;

      const levels: CompareLevel[] = currentMap.levels.map((level) => {
        const before = earlierMap.levels.find((l) => l.level.id === level.level.id);
        const note = !before
          ? 'The earlier survey did not cover this level.'
          : !level.grid || !before.grid
            ? 'One of the surveys has too few stations on this level for contours.'
            : level.sources.length === 0
              ? 'No magnet is placed on this level: the table has no rays.'
              : null;
        const rays: CompareLevel['rays'] = [];
        if (before && level.grid && before.grid) {
          // A line neither survey drew on this level has nothing to measure.
          const drawn = levelsT.filter((levelT) => Boolean(pick(level, levelT)?.polygons.length || pick(before, levelT)?.polygons.length));
          for (const source of level.sources)
            for (const levelT of drawn)
              for (const bearingDeg of bearings) {
                const a = pick(level, levelT);
                const b = pick(before, levelT);
                const now = a ? rayContourCrossing(a, source.xM, source.yM, bearingDeg, level.coverage, EDGE_TOLERANCE_CELLS * level.grid.cellSizeM) : null;
                const then = b ? rayContourCrossing(b, source.xM, source.yM, bearingDeg, before.coverage, EDGE_TOLERANCE_CELLS * before.grid.cellSizeM) : null;
                rays.push({
                  sourceId: source.id,
                  sourceName: source.name,
                  bearingDeg,
                  levelT,
                  currentM: now?.distanceM ?? null,
                  earlierM: then?.distanceM ?? null,
                  movedM: now && then ? now.distanceM - then.distanceM : null,
                  currentAtEdge: now?.atSurveyEdge ?? false,
                  earlierAtEdge: then?.atSurveyEdge ?? false,
                });
              }
        }
        return {
          levelId: level.level.id,
          levelName: level.level.name,
          currentContours: level.contours,
          earlierContours: before ? before.contours.filter((c) => levelsT.includes(c.levelT)) : [],
          rays,
          note,
        };
      });
      const summary = (m: SurveyMap) => ({ id: m.survey.id, name: m.survey.name, state: m.survey.state, signedOffAt: m.survey.signedOffAt });
      return {
        current: summary(currentMap),
        earlier: summary(earlierMap),
        levelsT: levelsT.map((levelT) => ({ levelT, label: labelOf(levelT) })),
        bearingsDeg: bearings,
        levels,
        cautions: currentMap.cautions,
      };
    },

    /**
     * GET …/exports/survey.geojson: stations, rooms and contours as a GeoJSON FeatureCollection
     * (RFC 7946 structure) whose coordinates are PLAN METRES of each feature's level, not longitude and
     * latitude — every feature names its level, plan and calibration in its properties, and the
     * collection says so in `coordinateSystem`.
     */
    async geojson(organisationId: string, surveyId: string, caller: Caller): Promise<{ fileName: string; body: object }> {
      const survey = await surveyFor(organisationId, surveyId, caller);
      const map = await mapObject(survey, []);
      const features: object[] = [];
      for (const level of map.levels) {
        const where = {
          levelId: level.level.id,
          levelName: level.level.name,
          planId: level.plan?.id ?? null,
          planName: level.plan?.originalName ?? null,
          calibration: level.plan
            ? {
                metresPerPixel: level.plan.metresPerPixel,
                originXPx: level.plan.originXPx,
                originYPx: level.plan.originYPx,
                northAngleDeg: level.plan.northAngleDeg,
                widthPx: level.plan.widthPx,
                heightPx: level.plan.heightPx,
              }
            : null,
        };
        const zoneName = (i: number | null) => (i === null ? null : i < 0 ? map.zoneSet.belowLabel : (map.zoneSet.thresholds[i]?.name ?? null));
        for (const s of level.stations) {
          features.push({
            type: 'Feature',
            id: s.id,
            geometry: { type: 'Point', coordinates: [s.xM, s.yM] },
            properties: { kind: 'station', ...where, label: s.label, roomId: s.roomId, fieldT: s.fieldT, readingId: s.readingId, readingCount: s.readingCount, zoneIndex: s.zoneIndex, zone: zoneName(s.zoneIndex) },
          });
        }
        for (const r of level.rooms) {
          const ring = r.polygon.map(([x, y]) => [x, y]);
          if (ring.length > 0) ring.push([...ring[0]!]);
          features.push({
            type: 'Feature',
            id: r.id,
            geometry: { type: 'Polygon', coordinates: [ring] },
            properties: { kind: 'room', ...where, name: r.name, use: r.use, sensitivity: r.sensitivity, stationCount: r.stationCount, minFieldT: r.minFieldT, maxFieldT: r.maxFieldT, zoneIndex: r.zoneIndex, zone: zoneName(r.zoneIndex) },
          });
        }
        for (const c of level.contours) {
          features.push({
            type: 'Feature',
            geometry: { type: 'MultiPolygon', coordinates: c.polygons },
            properties: { kind: 'contour', ...where, levelT: c.levelT, label: c.label, zoneIndex: c.zoneIndex, encloses: `|B| ≥ ${c.levelT} T` },
          });
        }
      }
      const safeName = survey.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'survey';
      return {
        fileName: `${safeName}.geojson`,
        body: {
          type: 'FeatureCollection',
          coordinateSystem: 'Plan metres of each feature’s level: x to the right of the plan image, y up it (see each feature’s planId and calibration). Not longitude and latitude.',
          survey: { id: map.survey.id, name: map.survey.name, state: map.survey.state, siteName: map.survey.siteName, signedOffAt: map.survey.signedOffAt },
          zoneSet: { name: map.zoneSet.name, edition: map.zoneSet.edition, thresholds: map.zoneSet.thresholds },
          dataVersion: map.dataVersion,
          generatedAt: map.computedAt,
          cautions: [...new Set([...map.cautions, ...GENERAL_SAFETY_CAUTIONS])],
          features,
        },
      };
    },
  };
}
export type SurveyMapService = ReturnType<typeof createSurveyMapService>;
