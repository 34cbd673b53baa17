/**
 * The survey map (issue 7 §1–2, §6): what GET …/surveys/:surveyId/map and …/compare answer. Fields are
 * tesla and plan metres (x right, y up the plan); polygons are GeoJSON-style MultiPolygon coordinates.
 */
import { z } from 'zod';
import { UuidSchema } from './common';
import { SurveyStateSchema } from './home';
import { RepeatGroupSchema } from './sync';

/** Extra contour levels a reviewer may add to the zone set's lines. */
export const MAX_EXTRA_LEVELS = 8;
/** Rays per source in a comparison. */
export const MAX_COMPARE_BEARINGS = 24;
/** Default rays of a comparison: every 45°, clockwise from up the plan. */
export const DEFAULT_COMPARE_BEARINGS_DEG = [0, 45, 90, 135, 180, 225, 270, 315] as const;

const teslaList = (max: number, what: string) =>
  z
    .string()
    .trim()
    .max(400)
    .transform((text, ctx) => {
      if (text === '') return [] as number[];
      const values = text.split(',').map((part) => Number(part.trim()));
      if (values.length > max) ctx.addIssue({ code: 'custom', message: `At most ${max} ${what}.` });
      if (values.some((v) => !Number.isFinite(v))) ctx.addIssue({ code: 'custom', message: `Give the ${what} as numbers separated by commas.` });
      return values;
    });

/** `?levels=0.0002,0.005`: extra contour levels in tesla (each > 0 and ≤ 100 T). */
export const SurveyMapQuerySchema = z.object({
  levels: teslaList(MAX_EXTRA_LEVELS, 'extra levels (tesla)')
    .pipe(z.array(z.number().positive('Contour levels must be above 0 T.').max(100, 'Contour levels above 100 T are not fields anyone surveys.')))
    .optional(),
});
export type SurveyMapQuery = z.infer<typeof SurveyMapQuerySchema>;

/** `?with=<surveyId>&bearings=0,90&levels=…`: the earlier survey and the rays, degrees clockwise from up the plan. */
export const SurveyCompareQuerySchema = SurveyMapQuerySchema.extend({
  with: UuidSchema,
  bearings: teslaList(MAX_COMPARE_BEARINGS, 'bearings (degrees)')
    .pipe(z.array(z.number().min(0, 'Bearings run from 0° to 360°.').lt(360, 'Bearings run from 0° to below 360°.')))
    .optional(),
});
export type SurveyCompareQuery = z.infer<typeof SurveyCompareQuerySchema>;

const PointSchema = z.tuple([z.number(), z.number()]);
const RingSchema = z.array(PointSchema);
export const MultiPolygonSchema = z.array(z.array(RingSchema));

export const MapZoneThresholdSchema = z.object({
  name: z.string(),
  fieldT: z.number(),
  caution: z.string(),
});

export const MapContourSchema = z.object({
  levelT: z.number(),
  /** Index in the zone set's thresholds (ascending), or null for a level the reviewer added. */
  zoneIndex: z.number().int().nullable(),
  label: z.string(),
  polygons: MultiPolygonSchema,
  labelPoints: z.array(PointSchema),
});
export type MapContour = z.infer<typeof MapContourSchema>;

export const MapStationSchema = z.object({
  id: UuidSchema,
  label: z.string().nullable(),
  roomId: UuidSchema.nullable(),
  xM: z.number(),
  yM: z.number(),
  /** |B| of the latest reading taking part (live, not rejected), tesla; null when there is none. */
  fieldT: z.number().nullable(),
  /** The reading that value comes from. */
  readingId: UuidSchema.nullable(),
  /** Live readings at the station (rejected ones included). */
  readingCount: z.number().int(),
  /** Index of the highest threshold reached (−1 below all), null without a value. */
  zoneIndex: z.number().int().nullable(),
  /** The latest decision on that reading asks for it to be measured again. */
  remeasure: z.boolean(),
});
export type MapStation = z.infer<typeof MapStationSchema>;

export const MapRoomSchema = z.object({
  id: UuidSchema,
  name: z.string(),
  use: z.string().nullable(),
  sensitivity: z.string(),
  polygon: RingSchema,
  stationCount: z.number().int(),
  minFieldT: z.number().nullable(),
  maxFieldT: z.number().nullable(),
  /** The room's highest class (that of its highest |B|), null with no readings. */
  zoneIndex: z.number().int().nullable(),
});
export type MapRoom = z.infer<typeof MapRoomSchema>;

/**
 * A repeat-reading group on the map: where it is and how far its readings spread (the groups of
 * GET …/repeats, without the member reading ids, which the review table lists).
 */
export const MapRepeatGroupSchema = RepeatGroupSchema.pick({ stationIds: true, count: true, meanT: true, spreadT: true, minT: true, maxT: true, maxEn: true, disagree: true, flagId: true }).extend({
  /** Centroid of the member stations, plan metres. */
  xM: z.number(),
  yM: z.number(),
});
export type MapRepeatGroup = z.infer<typeof MapRepeatGroupSchema>;

export const MapDipoleSchema = z.object({
  sourceId: UuidSchema,
  sourceName: z.string(),
  ok: z.boolean(),
  /** Why there is no fit (too few stations…), when ok is false. */
  reason: z.string().nullable(),
  momentAm2: z.tuple([z.number(), z.number(), z.number()]).nullable(),
  momentMagnitudeAm2: z.number().nullable(),
  /** Root-mean-square of ln(measured/predicted): 0.1 is about 10 % scatter. */
  rmsLogResidual: z.number().nullable(),
  converged: z.boolean(),
  planeHeightM: z.number().nullable(),
  residuals: z.array(z.object({ stationId: UuidSchema, relativeResidual: z.number() })),
  contours: z.array(z.object({ levelT: z.number(), ring: RingSchema })),
});
export type MapDipole = z.infer<typeof MapDipoleSchema>;

export const MapPlanSchema = z.object({
  id: UuidSchema,
  originalName: z.string().nullable(),
  widthPx: z.number().int(),
  heightPx: z.number().int(),
  metresPerPixel: z.number().nullable(),
  originXPx: z.number().nullable(),
  originYPx: z.number().nullable(),
  northAngleDeg: z.number().nullable(),
  imageUrl: z.string(),
});
export type MapPlan = z.infer<typeof MapPlanSchema>;

export const MapSourceSchema = z.object({
  id: UuidSchema,
  name: z.string(),
  kind: z.string(),
  nominalFieldT: z.number(),
  xM: z.number(),
  yM: z.number(),
});

export const LevelMapSchema = z.object({
  level: z.object({ id: UuidSchema, name: z.string(), ordinal: z.number().int(), elevationM: z.number() }),
  plan: MapPlanSchema.nullable(),
  stations: z.array(MapStationSchema),
  /** The interpolation grid (plan metres) and the surveyed area; null with a reason when there is no map. */
  grid: z.object({ originXM: z.number(), originYM: z.number(), cellSizeM: z.number(), width: z.number().int(), height: z.number().int() }).nullable(),
  coverage: RingSchema.nullable(),
  gridNote: z.string().nullable(),
  contours: z.array(MapContourSchema),
  rooms: z.array(MapRoomSchema),
  repeatGroups: z.array(MapRepeatGroupSchema),
  sources: z.array(MapSourceSchema),
  dipoles: z.array(MapDipoleSchema),
});
export type LevelMap = z.infer<typeof LevelMapSchema>;

export const SurveyMapSchema = z.object({
  survey: z.object({
    id: UuidSchema,
    name: z.string(),
    state: SurveyStateSchema,
    siteId: UuidSchema,
    siteName: z.string(),
    signedOffAt: z.string().nullable(),
  }),
  zoneSet: z.object({
    id: UuidSchema.nullable(),
    name: z.string(),
    edition: z.string(),
    /** True when the survey has no zone set and IEC 60601-2-33 ed. 4 stands in. */
    fallback: z.boolean(),
    belowLabel: z.string(),
    thresholds: z.array(MapZoneThresholdSchema),
  }),
  cautions: z.array(z.string()),
  extraLevelsT: z.array(z.number()),
  /** Highest change sequence of everything the map is made from: the cache key. */
  dataVersion: z.number().int(),
  computedAt: z.string(),
  computeMs: z.number(),
  levels: z.array(LevelMapSchema),
});
export type SurveyMap = z.infer<typeof SurveyMapSchema>;

export const CompareSurveySchema = z.object({ id: UuidSchema, name: z.string(), state: SurveyStateSchema, signedOffAt: z.string().nullable() });

export const CompareRaySchema = z.object({
  sourceId: UuidSchema,
  sourceName: z.string(),
  bearingDeg: z.number(),
  levelT: z.number(),
  /** Distance from the source to the outermost crossing of the line, m; null when the ray meets no line. */
  currentM: z.number().nullable(),
  earlierM: z.number().nullable(),
  /** current − earlier, m (positive: the line moved outwards). */
  movedM: z.number().nullable(),
  /** The crossing is where the line closes along the surveyed area's edge: the true line may lie further out. */
  currentAtEdge: z.boolean(),
  earlierAtEdge: z.boolean(),
});
export type CompareRay = z.infer<typeof CompareRaySchema>;

export const CompareLevelSchema = z.object({
  levelId: UuidSchema,
  levelName: z.string(),
  currentContours: z.array(MapContourSchema),
  earlierContours: z.array(MapContourSchema),
  rays: z.array(CompareRaySchema),
  note: z.string().nullable(),
});
export type CompareLevel = z.infer<typeof CompareLevelSchema>;

export const SurveyCompareSchema = z.object({
  current: CompareSurveySchema,
  earlier: CompareSurveySchema,
  /** The current survey's lines (and any extra levels), drawn for both surveys so they compare. */
  levelsT: z.array(z.object({ levelT: z.number(), label: z.string() })),
  bearingsDeg: z.array(z.number()),
  levels: z.array(CompareLevelSchema),
  cautions: z.array(z.string()),
});
export type SurveyCompare = z.infer<typeof SurveyCompareSchema>;
