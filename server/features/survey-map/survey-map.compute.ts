/**
 * Builds a survey map from its inputs (pure apart from hashing): merged stations with the |B| of their
 * latest reading taking part and its class, rooms with their highest class, repeat-reading groups with
 * their spread, interpolated grids with isogauss contours at the zone set's lines and any extra levels,
 * and a dipole fit per magnet with its residuals (shared/maps/level-map.ts does the field work).
 *
 * Taking part: live readings at live stations whose latest decision is not `rejected` (the rule the
 * repeat groups of sync follow). A station's value is its latest such reading by the device clock.
 *
 * Repeat groups follow server/features/sync/repeats.service.ts exactly (same grouping radius, points at
 * the station's x, y and the reading's height, expanded uncertainty U = k·u with k = 2 per the GUM,
 * JCGM 100:2008 §6.3, recalled; 2 % relative standard uncertainty for a meter that states none, common
 * practice, recalled) and carry the same fingerprint, so a group here names the flag sync raised for it.
 * They are recomputed here rather than asked of sync because reading a map must never write flags
 * (shared/maps/repeat-groups.ts: the same groups, found faster where readings share a spot).
 */
import { createHash } from 'node:crypto';
import { computeDipoleLayers, computeLevelField, type LevelStationInput } from '../../../shared/maps/level-map';
import { groupRepeatsFast } from '../../../shared/maps/repeat-groups';
import { physicsZoneSet, summariseRoom, zoneIndexOf } from '../../../shared/maps/zones';
import { GENERAL_SAFETY_CAUTIONS, type RepeatReading } from '../../../shared/physics';
import { roomForPoint } from '../../../shared/plans/polygon';
import type { LevelMap, MapContour, MapRepeatGroup, SurveyMap } from '../../../shared/schemas/survey-map';
import type { MapInputs, MapSurveyRow } from './survey-map.repository';

const COVERAGE_FACTOR_K = 2;
const DEFAULT_RELATIVE_STANDARD_UNCERTAINTY = 0.02;
/** Height of a magnet's centre above its floor when the site setup gives none (common practice for a scanner's isocentre). */
const DEFAULT_SOURCE_HEIGHT_M = 1;

const sha256Hex = (text: string) => createHash('sha256').update(text).digest('hex');

/** Where the map fetches a plan's image (served by the site-setup feature). */
export const planImageUrl = (organisationId: string, planId: string) => `/api/orgs/${organisationId}/plans/${planId}/image`;

export function computeSurveyMap(survey: MapSurveyRow, inputs: MapInputs, extraLevelsT: readonly number[], now: Date): SurveyMap {
  const started = performance.now();
  const zoneSet = physicsZoneSet(inputs.zoneSet);
  const thresholds = zoneSet.thresholds.map((t) => ({ name: t.label, fieldT: t.thresholdTesla, caution: t.caution }));
  const thresholdValues = new Set(thresholds.map((t) => t.fieldT));
  const extras = [...new Set(extraLevelsT)].filter((v) => !thresholdValues.has(v)).sort((a, b) => a - b);
  const contourLevels = [...thresholds.map((t) => t.fieldT), ...extras].sort((a, b) => a - b);

  // Latest reading taking part per station; every live reading counts towards readingCount.
  const latest = new Map<string, MapInputs['readings'][number]>();
  const readingCount = new Map<string, number>();
  const partaking: MapInputs['readings'] = [];
  for (const r of inputs.readings) {
    readingCount.set(r.station_id, (readingCount.get(r.station_id) ?? 0) + 1);
    if (inputs.verdicts.get(r.id) === 'rejected') continue;
    latest.set(r.station_id, r); // oldest first: the last one seen is the latest
    partaking.push(r);
  }

  const stationsByLevel = new Map<string, MapInputs['stations']>();
  for (const st of inputs.stations) {
    const list = stationsByLevel.get(st.level_id);
    if (list) list.push(st);
    else stationsByLevel.set(st.level_id, [st]);
  }
  const stationById = new Map(inputs.stations.map((s) => [s.id, s]));
  const wanted = new Set(survey.levelIds);
  const levels = inputs.levels.filter((l) => wanted.has(l.id) || stationsByLevel.has(l.id));

  const levelMaps: LevelMap[] = levels.map((level) => {
    const stations = stationsByLevel.get(level.id) ?? [];
    const rooms = inputs.rooms.filter((r) => r.level_id === level.id);
    const mapStations = stations.map((st) => {
      const reading = latest.get(st.id) ?? null;
      const fieldT = reading ? reading.field_t : null;
      const roomId = st.room_id ?? roomForPoint(rooms, st.x_m, st.y_m)?.id ?? null;
      return {
        id: st.id,
        label: st.label,
        roomId,
        xM: st.x_m,
        yM: st.y_m,
        fieldT,
        readingId: reading?.id ?? null,
        readingCount: readingCount.get(st.id) ?? 0,
        zoneIndex: zoneIndexOf(fieldT, zoneSet),
        remeasure: reading ? inputs.verdicts.get(reading.id) === 'remeasure' : false,
      };
    });
    const fieldInputs: LevelStationInput[] = mapStations.map((s) => ({ id: s.id, xM: s.xM, yM: s.yM, fieldT: s.fieldT, heightM: s.readingId ? (latest.get(s.id)?.height_m ?? 1) : 1 }));
    const field = computeLevelField(fieldInputs, contourLevels);
    const contours: MapContour[] = field.ok
      ? field.field.contours.map((c) => {
          const zoneIndex = zoneSet.thresholds.findIndex((t) => t.thresholdTesla === c.levelT);
          return {
            levelT: c.levelT,
            zoneIndex: zoneIndex >= 0 ? zoneIndex : null,
            label: zoneIndex >= 0 ? (zoneSet.thresholds[zoneIndex]?.label ?? '') : 'Added level',
            polygons: c.polygons,
            labelPoints: c.labelPoints,
          };
        })
      : [];

    const fieldsByRoom = new Map<string, (number | null)[]>();
    for (const s of mapStations) {
      if (!s.roomId) continue;
      const list = fieldsByRoom.get(s.roomId);
      if (list) list.push(s.fieldT);
      else fieldsByRoom.set(s.roomId, [s.fieldT]);
    }

    // Repeat groups of this level's readings taking part.
    const levelReadings: RepeatReading[] = [];
    for (const r of partaking) {
      const st = stationById.get(r.station_id);
      if (!st || st.level_id !== level.id) continue;
      const u = r.instrument_id ? (inputs.uncertainties.get(r.instrument_id) ?? null) : null;
      levelReadings.push({ id: r.id, xM: st.x_m, yM: st.y_m, zM: r.height_m, fieldTesla: r.field_t, relativeExpandedUncertainty: COVERAGE_FACTOR_K * (u ?? DEFAULT_RELATIVE_STANDARD_UNCERTAINTY) });
    }
    const stationOfReading = new Map(partaking.map((r) => [r.id, r.station_id]));
    const repeatGroups: MapRepeatGroup[] = groupRepeatsFast(levelReadings, survey.repeatRadiusM)
      .map((g) => {
        const stationIds = [...new Set(g.readingIds.map((id) => stationOfReading.get(id)!))].sort();
        // Sync raises a flag only for a group that disagrees, under sha256 of its sorted reading ids.
        const flagId = g.disagree ? (inputs.repeatFlags.get(`repeat:${sha256Hex([...g.readingIds].sort().join(','))}`) ?? null) : null;
        let x = 0;
        let y = 0;
        for (const id of stationIds) {
          const st = stationById.get(id)!;
          x += st.x_m;
          y += st.y_m;
        }
        return {
          stationIds,
          count: g.count,
          meanT: g.meanTesla,
          spreadT: g.spreadTesla,
          minT: g.minTesla,
          maxT: g.maxTesla,
          maxEn: Number.isFinite(g.maxEn) ? g.maxEn : null,
          disagree: g.disagree,
          flagId,
          xM: x / stationIds.length,
          yM: y / stationIds.length,
        };
      })
      .sort((a, b) => (a.stationIds[0] ?? '').localeCompare(b.stationIds[0] ?? '') || a.count - b.count);

    const sources = inputs.sources.filter((s) => s.level_id === level.id);
    const dipoles = computeDipoleLayers(
      fieldInputs,
      sources.map((s) => ({ id: s.id, xM: s.x_m, yM: s.y_m, zM: s.z_m ?? DEFAULT_SOURCE_HEIGHT_M })),
      contourLevels,
    ).map((d) => {
      const sourceId = d.ok ? d.layer.sourceId : d.sourceId;
      const name = sources.find((s) => s.id === sourceId)?.name ?? '';
      if (!d.ok) return { sourceId: d.sourceId, sourceName: name, ok: false, reason: d.reason, momentAm2: null, momentMagnitudeAm2: null, rmsLogResidual: null, converged: false, planeHeightM: null, residuals: [], contours: [] };
      const l = d.layer;
      return { sourceId: l.sourceId, sourceName: name, ok: true, reason: null, momentAm2: l.momentAm2, momentMagnitudeAm2: l.momentMagnitudeAm2, rmsLogResidual: l.rmsLogResidual, converged: l.converged, planeHeightM: l.planeHeightM, residuals: l.residuals, contours: l.contours };
    });

    const plan = inputs.plans.find((p) => p.level_id === level.id) ?? null;
    return {
      level: { id: level.id, name: level.name, ordinal: level.ordinal, elevationM: level.elevation_m },
      plan: plan
        ? {
            id: plan.id,
            originalName: plan.original_name,
            widthPx: plan.width_px,
            heightPx: plan.height_px,
            metresPerPixel: plan.metres_per_pixel,
            originXPx: plan.origin_x_px,
            originYPx: plan.origin_y_px,
            northAngleDeg: plan.north_angle_deg,
            imageUrl: planImageUrl(survey.organisationId, plan.id),
          }
        : null,
      stations: mapStations,
      grid: field.ok ? field.field.grid : null,
      coverage: field.ok ? field.field.coverage : null,
      gridNote: field.ok ? null : field.reason,
      contours,
      rooms: rooms.map((r) => ({ id: r.id, name: r.name, use: r.use, sensitivity: r.sensitivity, polygon: r.polygon, ...summariseRoom(fieldsByRoom.get(r.id) ?? [], zoneSet) })),
      repeatGroups,
      sources: sources.map((s) => ({ id: s.id, name: s.name, kind: s.kind, nominalFieldT: s.nominal_field_t, xM: s.x_m, yM: s.y_m })),
      dipoles,
    };
  });

  return {
    survey: { id: survey.id, name: survey.name, state: survey.state, siteId: survey.siteId, siteName: survey.siteName, signedOffAt: survey.signedOffAt ? survey.signedOffAt.toISOString() : null },
    zoneSet: {
      id: inputs.zoneSet?.id ?? null,
      name: zoneSet.name,
      edition: zoneSet.follows,
      fallback: inputs.zoneSet === null,
      belowLabel: zoneSet.belowLabel,
      thresholds,
    },
    cautions: [...new Set([...thresholds.map((t) => t.caution), ...GENERAL_SAFETY_CAUTIONS])],
    extraLevelsT: extras,
    dataVersion: inputs.dataVersion,
    computedAt: now.toISOString(),
    computeMs: Math.round((performance.now() - started) * 10) / 10,
    levels: levelMaps,
  };
}
