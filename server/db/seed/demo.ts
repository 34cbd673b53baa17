/**
 * The demo seed: the invented "Harrowby Bridge Hospital & Research Campus" of DESIGN.md §7, plus a second,
 * unrelated organisation ("Kestrel Point Physics Lab") so that organisation isolation can be seen.
 *
 * EVERYTHING HERE IS MADE UP: people, e-mail addresses, sites, plans, magnets, serial numbers, dates and
 * every reading. The readings come from a point-dipole model of the invented magnets (Jackson,
 * Classical Electrodynamics, 3rd ed., §5.6, via shared/physics/dipole.ts) plus an invented Earth field
 * and seeded measurement noise, so every run makes the same numbers.
 *
 * The story: two signed-off annual checks a year apart (2024, 2025) and the open
 * 2026 check of the same campus, walked by several surveyors on several devices; repeat readings, one group of
 * which disagrees (a reading against a steel door frame) and is sent back for re-measurement; sweeps with peaks
 * the predicted lines explain and peaks they do not; EMC flags open, acknowledged and resolved. The flags and
 * the sign-offs (report SHA-256) are made by the server's own EMC and review code once the rows are written,
 * in the same transaction (demo-review.ts).
 *
 * Idempotent: each organisation has a fixed id; an organisation that already exists is left exactly as
 * it is, so running the seed twice changes nothing. Two seeders racing are serialised by an advisory
 * lock. Every synced row gets its change_seq from the organisation's counter (server/db/audit.ts), and a
 * change_log row, so a device's first pull sees the demo like any other data.
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { eq, inArray, sql, type InferInsertModel, type Table } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';
import type { Role } from '../../../shared/schemas/common';
import { dipoleFieldVectorTesla, type Vec3 } from '../../../shared/physics/dipole';
import { cyclotronFrequencyHz, protonPrecessionFrequencyHz } from '../../../shared/physics/lines';
import { hashPassword } from '../../features/auth/password';
import { recordAudit, recordChanges } from '../audit';
import type { Db, Tx } from '../client';
import {
  attachments,
  decisions,
  emitters,
  fieldReadings,
  instruments,
  levels,
  memberships,
  organisations,
  plans,
  rooms,
  sites,
  sources,
  stations,
  surveyAssignments,
  surveys,
  sweeps,
  users,
  walks,
  watchBands,
  zoneSets,
  type PeakMarker,
} from '../schema';
import type { SyncedEntity } from '../schema/synced-tables';
import {
  DEMO_PASSWORD,
  HARROWBY,
  HARROWBY_EMITTERS,
  HARROWBY_INSTRUMENTS,
  HARROWBY_LEVELS,
  HARROWBY_SITE,
  HARROWBY_SOURCES,
  HARROWBY_WATCH_BANDS,
  HARROWBY_ZONE_SETS,
  KESTREL,
  KESTREL_LEVELS,
  KESTREL_SITE,
  KESTREL_SOURCES,
  MR_RECEIVE_HALF_WIDTH_HZ,
  PLAN_PX_PER_M,
  type LevelSpec,
  type PersonSpec,
  type SourceSpec,
} from './demo-data';
import { demoId } from './ids';
import { PLAN_HEIGHT_PX, PLAN_WIDTH_PX, PLANS_DIR } from './plan-svg';
import { createPrng, type Prng } from './prng';
import { DEMO_TRACES, demoTraceRows } from './demo-traces';
import { acknowledgeDemoFlag, computeDemoFlags, resolveDemoFlag, signOffDemoSurvey } from './demo-review';
import type { FlagRow } from '../../features/emc/emc.repository';

export { DEMO_PASSWORD } from './demo-data';

export const HARROWBY_ORG_ID = demoId('organisation:harrowby');
export const KESTREL_ORG_ID = demoId('organisation:kestrel');
/** The demo sweeps that carry a trace file, by key (server/db/seed/demo-traces.ts). */
export const DEMO_TRACE_SWEEP_IDS: Record<string, string> = Object.fromEntries(Object.keys(DEMO_TRACES).map((key) => [key, demoId(`${HARROWBY.key}:survey:2026:sweep:${key}`)]));

/** Serialises concurrent seeders (an arbitrary fixed key). */
const SEED_LOCK_KEY = 7_320_114;

/**
 * Invented Earth field in the plan frame (x east, y north, z up), T: 19 µT north, 45 µT down,
 * |B| ≈ 48.8 µT — inside the 22–67 µT range of REFERENCES.md. Demo only.
 */
const EARTH_FIELD_T: Vec3 = [0, 19e-6, -45e-6];
/** Probe offset noise, T (invented: a zeroed meter's last-digit wander). */
const OFFSET_NOISE_T = 0.1e-6;
/** The fluxgate's range (2 mT, demo-data.ts) with some headroom: its surveyor keeps below this. */
const FLUXGATE_RANGE_T = 1.5e-3;
/** Invented: a probe held against a steel door frame reads the local field this much too high. */
const STEEL_DOOR_SCALE = 1.3;
/** Stations closer than this to a magnet centre (horizontally, same level) are not placed: that is inside the magnet. */
const MAGNET_KEEP_OUT_M = 1.5;

export interface DemoSeedResult {
  /** The Harrowby Bridge organisation. */
  organisationId: string;
  /** Harrowby Bridge user id per role (the first surveyor for `surveyor`). */
  users: Record<Role, string>;
  /** False when both organisations were already there and nothing was written. */
  created: boolean;
}

// ---------------------------------------------------------------------------------------------------------------------
// Rows are collected per table first, then every synced row gets its change_seq in one reservation.

interface SyncedRow {
  id: string;
  changeSeq: number;
}

interface Batch {
  entity: SyncedEntity;
  table: PgTable;
  rows: SyncedRow[];
}

class RowSet {
  readonly batches: Batch[] = [];
  /** Work done once the rows are written, in the same transaction (sign-offs and flags, by the server's own code). */
  readonly afterWrite: ((tx: Tx) => Promise<void>)[] = [];
  /** Files that have "arrived" for synced rows (the demo traces); not synced rows themselves. */
  readonly attachments: InferInsertModel<typeof attachments>[] = [];
  add<T extends PgTable & Table>(entity: SyncedEntity, table: T, rows: InferInsertModel<T>[]): void {
    if (rows.length > 0) this.batches.push({ entity, table, rows: rows as unknown as SyncedRow[] });
  }
  count(entity: SyncedEntity): number {
    return this.batches.filter((b) => b.entity === entity).reduce((n, b) => n + b.rows.length, 0);
  }
}

/** Multi-row INSERTs (STACK.md: fine for a few hundred rows), chunked well under 65,535 bind parameters. */
const INSERT_CHUNK_ROWS = 500;

async function writeRowSet(tx: Tx, organisationId: string, set: RowSet): Promise<void> {
  const all = set.batches.flatMap((b) => b.rows.map((row) => ({ entity: b.entity, row })));
  const seqs = await recordChanges(
    tx,
    organisationId,
    all.map(({ entity, row }) => ({ entity, entityId: row.id, revision: 1, deleted: false })),
  );
  all.forEach(({ row }, i) => (row.changeSeq = seqs[i]!));
  for (const b of set.batches) {
    for (let start = 0; start < b.rows.length; start += INSERT_CHUNK_ROWS) {
      await tx.insert(b.table).values(b.rows.slice(start, start + INSERT_CHUNK_ROWS) as InferInsertModel<PgTable>[]);
    }
  }
  if (set.attachments.length > 0) await tx.insert(attachments).values(set.attachments);
}

// ---------------------------------------------------------------------------------------------------------------------
// Geometry and the field model.

const boundsOf = (polygon: [number, number][]) => ({
  minX: Math.min(...polygon.map(([x]) => x)),
  maxX: Math.max(...polygon.map(([x]) => x)),
  minY: Math.min(...polygon.map(([, y]) => y)),
  maxY: Math.max(...polygon.map(([, y]) => y)),
});

interface PlacedSource {
  spec: SourceSpec;
  /** Centre in site coordinates (plan x, y; z above the campus datum), m. */
  centreM: Vec3;
  momentAm2: Vec3;
}

function placeSources(specs: SourceSpec[], levelSpecs: LevelSpec[]): PlacedSource[] {
  return specs.map((spec) => {
    const level = levelSpecs.find((l) => l.key === spec.levelKey)!;
    const [ax, ay, az] = spec.axis;
    const norm = Math.hypot(ax, ay, az);
    return {
      spec,
      centreM: [spec.xM, spec.yM, level.elevationM + spec.zM],
      momentAm2: [(spec.dipoleMomentAM2 * ax) / norm, (spec.dipoleMomentAM2 * ay) / norm, (spec.dipoleMomentAM2 * az) / norm],
    };
  });
}

/** Superposed dipole fields of the magnets installed on `onDate`, plus the Earth's field, T. */
function modelField(pointM: Vec3, placed: PlacedSource[], onDate: string): Vec3 {
  const total: [number, number, number] = [...EARTH_FIELD_T];
  for (const p of placed) {
    if (p.spec.installedOn > onDate) continue;
    const b = dipoleFieldVectorTesla({ sourceM: p.centreM, momentAm2: p.momentAm2 }, pointM);
    total[0] += b[0];
    total[1] += b[1];
    total[2] += b[2];
  }
  return total;
}

/** Four significant figures: what a meter's display shows and the surveyor types. */
const displayed = (valueT: number) => Number(valueT.toPrecision(4));

interface StationSpot {
  roomKey: string;
  xM: number;
  yM: number;
}

/** A station grid over the surveyed rooms of a level, skipping the magnets' own footprint. */
function stationGrid(level: LevelSpec, placed: PlacedSource[], spacingM: number): StationSpot[] {
  const spots: StationSpot[] = [];
  const here = placed.filter((p) => p.spec.levelKey === level.key);
  for (const r of level.rooms) {
    if (!r.surveyed) continue;
    const b = boundsOf(r.polygon);
    const offX = Math.min(spacingM / 2, (b.maxX - b.minX) / 2);
    const offY = Math.min(spacingM / 2, (b.maxY - b.minY) / 2);
    for (let x = b.minX + offX; x < b.maxX - 0.3; x += spacingM) {
      for (let y = b.minY + offY; y < b.maxY - 0.3; y += spacingM) {
        const xM = Number(x.toFixed(2));
        const yM = Number(y.toFixed(2));
        if (here.some((p) => Math.hypot(p.spec.xM - xM, p.spec.yM - yM) < MAGNET_KEEP_OUT_M)) continue;
        spots.push({ roomKey: r.key, xM, yM });
      }
    }
  }
  return spots;
}

// ---------------------------------------------------------------------------------------------------------------------
// Readings.

interface InstrumentRef {
  id: string;
  relativeUncertainty: number;
  /** A vector probe reads three axes even when only |B| is written down; a single-axis probe is turned toward the source for the largest reading. */
  probeOrientation: 'three_axis' | 'toward_source';
}

type ReadingMode = 'vector' | 'magnitude';

interface ReadingValues {
  magnitudeT: number | null;
  bxT: number | null;
  byT: number | null;
  bzT: number | null;
  fieldT: number;
}

function measure(trueB: Vec3, instrument: InstrumentRef, mode: ReadingMode, prng: Prng, scale = 1): ReadingValues {
  const magnitude = Math.hypot(...trueB) * scale;
  const rel = instrument.relativeUncertainty;
  if (mode === 'vector') {
    const sigma = (rel * magnitude) / Math.sqrt(3) + OFFSET_NOISE_T;
    const [bx, by, bz] = trueB.map((c) => displayed(c * scale + sigma * prng.normal())) as [number, number, number];
    return { magnitudeT: null, bxT: bx, byT: by, bzT: bz, fieldT: Math.hypot(bx, by, bz) };
  }
  // A single-axis probe turned for the largest reading shows |B|.
  const value = displayed(Math.max(0, magnitude * (1 + rel * prng.normal()) + OFFSET_NOISE_T * prng.normal()));
  return { magnitudeT: value, bxT: null, byT: null, bzT: null, fieldT: value };
}

// ---------------------------------------------------------------------------------------------------------------------

type UserIds = Map<string, string>;

async function insertPeople(tx: Tx, organisationId: string, people: readonly PersonSpec[], hashes: Map<string, string>): Promise<UserIds> {
  await tx
    .insert(users)
    .values(people.map((p) => ({ id: demoId(`user:${p.email}`), email: p.email, name: p.name, passwordHash: hashes.get(p.email)! })))
    // A person who already has an account (by e-mail) keeps it and its password.
    .onConflictDoNothing();
  const found = await tx
    .select({ id: users.id, email: users.email })
    .from(users)
    .where(inArray(sql`lower(${users.email})`, people.map((p) => p.email.toLowerCase())));
  const byEmail = new Map(found.map((u) => [u.email.toLowerCase(), u.id]));
  const ids: UserIds = new Map(people.map((p) => [p.key, byEmail.get(p.email.toLowerCase())!]));
  await tx
    .insert(memberships)
    .values(people.map((p) => ({ userId: ids.get(p.key)!, organisationId, role: p.role })))
    .onConflictDoNothing();
  return ids;
}

function planRows(organisationId: string, orgKey: string, levelSpecs: LevelSpec[]): InferInsertModel<typeof plans>[] {
  return levelSpecs.map((level) => {
    const fileName = `${orgKey}-${level.key}.svg`;
    const bytes = fs.readFileSync(path.join(PLANS_DIR, fileName));
    return {
      id: demoId(`${orgKey}:plan:${level.key}`),
      organisationId,
      changeSeq: 0,
      levelId: demoId(`${orgKey}:level:${level.key}`),
      // Where the plan-upload feature will keep it; the file itself ships in server/db/seed/plans.
      objectKey: `demo/${fileName}`,
      originalName: fileName,
      mime: 'image/svg+xml',
      byteSize: bytes.length,
      sha256: createHash('sha256').update(bytes).digest('hex'),
      widthPx: PLAN_WIDTH_PX,
      heightPx: PLAN_HEIGHT_PX,
      metresPerPixel: 1 / PLAN_PX_PER_M,
      originXPx: 0,
      originYPx: PLAN_HEIGHT_PX,
      northAngleDeg: 0,
    };
  });
}

function siteRows(set: RowSet, organisationId: string, orgKey: string, site: typeof HARROWBY_SITE, levelSpecs: LevelSpec[], sourceSpecs: SourceSpec[]) {
  const siteId = demoId(`${orgKey}:site:${site.key}`);
  set.add('sites', sites, [{ id: siteId, organisationId, changeSeq: 0, name: site.name, address: site.address, notes: site.notes }]);
  set.add(
    'levels',
    levels,
    levelSpecs.map((l) => ({
      id: demoId(`${orgKey}:level:${l.key}`),
      organisationId,
      changeSeq: 0,
      siteId,
      name: l.name,
      ordinal: l.ordinal,
      elevationM: l.elevationM,
    })),
  );
  set.add('plans', plans, planRows(organisationId, orgKey, levelSpecs));
  set.add(
    'rooms',
    rooms,
    levelSpecs.flatMap((l) =>
      l.rooms.map((r) => ({
        id: demoId(`${orgKey}:room:${r.key}`),
        organisationId,
        changeSeq: 0,
        levelId: demoId(`${orgKey}:level:${l.key}`),
        name: r.name,
        use: r.use,
        sensitivity: r.sensitivity,
        polygon: r.polygon,
      })),
    ),
  );
  set.add(
    'sources',
    sources,
    sourceSpecs.map((s) => ({
      id: demoId(`${orgKey}:source:${s.key}`),
      organisationId,
      changeSeq: 0,
      siteId,
      levelId: demoId(`${orgKey}:level:${s.levelKey}`),
      name: s.name,
      kind: s.kind,
      shielding: s.shielding,
      nominalFieldT: s.nominalFieldT,
      xM: s.xM,
      yM: s.yM,
      zM: s.zM,
      dipoleMomentAM2: s.dipoleMomentAM2,
      axisX: s.axis[0],
      axisY: s.axis[1],
      axisZ: s.axis[2],
      notes: s.notes,
    })),
  );
  return siteId;
}

interface SurveyPlan {
  key: string;
  name: string;
  zoneSetKey: string;
  startsOn: string;
  endsOn: string;
  /** Date the magnets are taken as installed on (ISO date). */
  onDate: string;
  spacingM: number;
  levelKeys: string[];
}

function buildHarrowby(organisationId: string, people: UserIds): RowSet {
  const org = HARROWBY.key;
  const id = (name: string) => demoId(`${org}:${name}`);
  const user = (key: string) => people.get(key)!;
  const set = new RowSet();

  set.add(
    'zone_sets',
    zoneSets,
    HARROWBY_ZONE_SETS.map((z) => ({
      id: id(`zone-set:${z.key}`),
      organisationId,
      changeSeq: 0,
      name: z.name,
      edition: z.edition,
      thresholds: z.thresholds,
      isDefault: z.isDefault,
      notes: z.notes,
    })),
  );
  const siteId = siteRows(set, organisationId, org, HARROWBY_SITE, HARROWBY_LEVELS, HARROWBY_SOURCES);

  const mri = HARROWBY_SOURCES.find((s) => s.key === 'mri')!;
  const mrReceiveHz = protonPrecessionFrequencyHz(mri.nominalFieldT);
  set.add('watch_bands', watchBands, [
    ...HARROWBY_WATCH_BANDS.map((b) => ({
      id: id(`watch-band:${b.key}`),
      organisationId,
      changeSeq: 0,
      name: b.name,
      lowerHz: b.lowerHz,
      upperHz: b.upperHz,
      reason: b.reason,
      source: b.source,
      severity: b.severity,
    })),
    {
      id: id('watch-band:mr1-receive'),
      organisationId,
      changeSeq: 0,
      siteId,
      name: 'MR 1 receive band (proton precession at 3 T)',
      lowerHz: mrReceiveHz - MR_RECEIVE_HALF_WIDTH_HZ,
      upperHz: mrReceiveHz + MR_RECEIVE_HALF_WIDTH_HZ,
      reason: 'MR 1 receives here. Proton NMR precession — not a cyclotron line.',
      source: 'CODATA 2018 γp/2π = 42.577 478 518 MHz/T × 3 T nominal; ±0.5 MHz width invented for the demo',
      severity: 'high' as const,
    },
  ]);

  set.add(
    'emitters',
    emitters,
    HARROWBY_EMITTERS.map((e) => ({
      id: id(`emitter:${e.key}`),
      organisationId,
      changeSeq: 0,
      roomId: id(`room:${e.roomKey}`),
      name: e.name,
      kind: e.kind,
      electronDensityPerM3: e.electronDensityPerM3,
      electronEnergyEv: e.electronEnergyEv,
      energyKind: e.energyKind,
      volumeM3: e.volumeM3,
      xM: e.xM,
      yM: e.yM,
      zM: e.zM,
      notes: e.notes,
    })),
  );

  set.add(
    'instruments',
    instruments,
    HARROWBY_INSTRUMENTS.map((i) => ({
      id: id(`instrument:${i.key}`),
      organisationId,
      changeSeq: 0,
      kind: i.kind,
      model: i.model,
      serial: i.serial,
      probe: i.probe,
      calibratedOn: i.calibratedOn,
      calibrationDueOn: i.calibrationDueOn,
      relativeUncertainty: i.relativeUncertainty,
      notes: i.notes,
    })),
  );
  const instrument = (key: string): InstrumentRef => {
    const spec = HARROWBY_INSTRUMENTS.find((i) => i.key === key)!;
    return {
      id: id(`instrument:${key}`),
      relativeUncertainty: spec.relativeUncertainty ?? 0,
      probeOrientation: spec.probe?.startsWith('3-axis') ? 'three_axis' : 'toward_source',
    };
  };
  const hall = instrument('hall');
  const fluxgate = instrument('fluxgate');

  const placed = placeSources(HARROWBY_SOURCES, HARROWBY_LEVELS);
  const levelByKey = new Map(HARROWBY_LEVELS.map((l) => [l.key, l]));
  const pointOf = (levelKey: string, xM: number, yM: number, heightM: number): Vec3 => [xM, yM, levelByKey.get(levelKey)!.elevationM + heightM];

  const surveyRows: InferInsertModel<typeof surveys>[] = [];
  const assignmentRows: InferInsertModel<typeof surveyAssignments>[] = [];
  const walkRows: InferInsertModel<typeof walks>[] = [];
  const stationRows: InferInsertModel<typeof stations>[] = [];
  const readingRows: InferInsertModel<typeof fieldReadings>[] = [];
  const sweepRows: InferInsertModel<typeof sweeps>[] = [];
  const decisionRows: InferInsertModel<typeof decisions>[] = [];
  /** Surveys written as submitted, signed off once their rows are in (finishHarrowby). */
  const signOffs: SignOff[] = [];

  const assign = (surveyKey: string, userKey: string, role: 'surveyor' | 'reviewer') =>
    assignmentRows.push({
      id: id(`survey:${surveyKey}:assignment:${userKey}:${role}`),
      organisationId,
      changeSeq: 0,
      surveyId: id(`survey:${surveyKey}`),
      userId: user(userKey),
      role,
    });

  /** Places the stations of one survey and level, returning them with their model field. */
  const placeStations = (survey: SurveyPlan, levelKey: string, walkId: string, byUser: string, extra: StationSpot[] = []) => {
    const level = levelByKey.get(levelKey)!;
    const spots = [...stationGrid(level, placed, survey.spacingM), ...extra];
    return spots.map((spot) => {
      const n = stationRows.length;
      const stationId = id(`survey:${survey.key}:station:${n}`);
      const heightM = 1;
      stationRows.push({
        id: stationId,
        organisationId,
        changeSeq: 0,
        surveyId: id(`survey:${survey.key}`),
        levelId: id(`level:${levelKey}`),
        walkId,
        roomId: id(`room:${spot.roomKey}`),
        label: `${levelKey.toUpperCase()}-${String(n + 1).padStart(3, '0')}`,
        xM: spot.xM,
        yM: spot.yM,
        heightM,
        createdByUserId: user(byUser),
      });
      return { stationId, spot, levelKey, trueB: modelField(pointOf(levelKey, spot.xM, spot.yM, heightM), placed, survey.onDate) };
    });
  };

  interface ReadingContext {
    survey: SurveyPlan;
    walkId: string;
    userKey: string;
    clock: { atMs: number };
    prng: Prng;
  }
  const addReading = (
    ctx: ReadingContext,
    station: { stationId: string; trueB: Vec3 },
    inst: InstrumentRef,
    mode: ReadingMode,
    options: { unitPreference: 'si' | 'gauss'; scale?: number; notes?: string; backgroundT?: number } = { unitPreference: 'si' },
  ) => {
    ctx.clock.atMs += Math.round((45 + ctx.prng.uniform() * 75) * 1000);
    const values = measure(station.trueB, inst, mode, ctx.prng, options.scale);
    const unit =
      options.unitPreference === 'gauss' ? (values.fieldT >= 0.1 ? ('kG' as const) : ('G' as const)) : values.fieldT >= 1e-3 ? ('mT' as const) : ('µT' as const);
    const readingId = id(`survey:${ctx.survey.key}:reading:${readingRows.length}`);
    readingRows.push({
      id: readingId,
      organisationId,
      changeSeq: 0,
      surveyId: id(`survey:${ctx.survey.key}`),
      stationId: station.stationId,
      walkId: ctx.walkId,
      instrumentId: inst.id,
      surveyorUserId: user(ctx.userKey),
      magnitudeT: values.magnitudeT,
      bxT: values.bxT,
      byT: values.byT,
      bzT: values.bzT,
      unit,
      probeOrientation: inst.probeOrientation,
      heightM: 1,
      backgroundT: options.backgroundT ?? null,
      zeroed: true,
      measuredAt: new Date(ctx.clock.atMs),
      notes: options.notes ?? null,
    });
    return { readingId, fieldT: values.fieldT };
  };

  /**
   * A signed-off annual check: Ada walks some levels with the three-axis Hall meter on the survey tablet,
   * Bram walks others with the fluxgate on his phone and cross-checks a few of Ada's ground-floor stations
   * (repeat groups across walks); the reviewer accepts every reading but an outlier, which is rejected
   * and measured again. The rows are written as `submitted`; the sign-off itself (report hash, flags) is
   * done after they are in the database, with the server's own code (finishHarrowby).
   */
  interface SignedOffSpec {
    plan: SurveyPlan;
    notes: string;
    prngSeed: string;
    adaLevels: string[];
    bramLevels: string[];
    adaWalk: { startedAt: string; endedAt: string };
    bramWalk: { startedAt: string; endedAt: string };
    /** Ada's reading on the ground floor (by station index) that hit something steel. */
    outlier: { index: number; scale: number; notes: string; decisionNote: string; decidedAt: string } | null;
    crossChecks: number;
    decisionsFrom: string;
    submittedAt: string;
    signedOffAt: string;
  }
  const signedOffSurvey = (spec: SignedOffSpec) => {
    const { plan } = spec;
    const surveyId = id(`survey:${plan.key}`);
    surveyRows.push({
      id: surveyId,
      organisationId,
      changeSeq: 0,
      siteId,
      name: plan.name,
      state: 'submitted',
      zoneSetId: id(`zone-set:${plan.zoneSetKey}`),
      levelIds: plan.levelKeys.map((key) => id(`level:${key}`)),
      startsOn: plan.startsOn,
      endsOn: plan.endsOn,
      species: ['electron', 'proton'],
      maxHarmonic: 3,
      submittedAt: new Date(spec.submittedAt),
      submittedByUserId: user('reviewer'),
      notes: spec.notes,
    });
    assign(plan.key, 'surveyor', 'surveyor');
    assign(plan.key, 'surveyor2', 'surveyor');
    assign(plan.key, 'reviewer', 'reviewer');
    signOffs.push({ surveyKey: plan.key, surveyId, signedOffAt: new Date(spec.signedOffAt) });
    const prng = createPrng(spec.prngSeed);
    const walkA = id(`survey:${plan.key}:walk:ada`);
    const walkB = id(`survey:${plan.key}:walk:bram`);
    walkRows.push(
      { id: walkA, organisationId, changeSeq: 0, surveyId, surveyorUserId: user('surveyor'), deviceId: 'demo-tablet-01', deviceLabel: 'Survey tablet 1', startedAt: new Date(spec.adaWalk.startedAt), endedAt: new Date(spec.adaWalk.endedAt) },
      { id: walkB, organisationId, changeSeq: 0, surveyId, surveyorUserId: user('surveyor2'), deviceId: 'demo-phone-07', deviceLabel: 'Bram’s phone', startedAt: new Date(spec.bramWalk.startedAt), endedAt: new Date(spec.bramWalk.endedAt) },
    );
    const ctxA: ReadingContext = { survey: plan, walkId: walkA, userKey: 'surveyor', clock: { atMs: Date.parse(spec.adaWalk.startedAt) }, prng };
    const ctxB: ReadingContext = { survey: plan, walkId: walkB, userKey: 'surveyor2', clock: { atMs: Date.parse(spec.bramWalk.startedAt) }, prng };
    const groundStations: { stationId: string; trueB: Vec3 }[] = [];
    const taken: string[] = [];
    const rejected: string[] = [];
    for (const levelKey of spec.adaLevels) {
      const placedStations = placeStations(plan, levelKey, walkA, 'surveyor');
      placedStations.forEach((st, i) => {
        const first = taken.length === 0;
        taken.push(addReading(ctxA, st, hall, 'vector', { unitPreference: 'si', backgroundT: first ? 48.8e-6 : undefined }).readingId);
        if (levelKey === 'g') groundStations.push(st);
        const outlier = spec.outlier;
        if (outlier && levelKey === 'g' && i === outlier.index) {
          // An outlier the reviewer rejected, then the station measured again.
          const bad = addReading(ctxA, st, hall, 'vector', { unitPreference: 'si', scale: outlier.scale, notes: outlier.notes });
          rejected.push(bad.readingId);
          decisionRows.push({
            id: id(`survey:${plan.key}:decision:rejected`),
            organisationId,
            changeSeq: 0,
            surveyId,
            fieldReadingId: bad.readingId,
            verdict: 'rejected',
            note: outlier.decisionNote,
            reviewerUserId: user('reviewer'),
            decidedAt: new Date(outlier.decidedAt),
          });
          taken.push(addReading(ctxA, st, hall, 'vector', { unitPreference: 'si', notes: 'Repeat, trolley moved away.' }).readingId);
        }
      });
    }
    for (const levelKey of spec.bramLevels) {
      for (const st of placeStations(plan, levelKey, walkB, 'surveyor2')) taken.push(addReading(ctxB, st, fluxgate, 'magnitude', { unitPreference: 'gauss' }).readingId);
    }
    // Bram repeats a few of Ada's ground-floor stations (within the fluxgate's range), giving repeat groups across walks.
    groundStations
      .filter((st) => Math.hypot(...st.trueB) < FLUXGATE_RANGE_T)
      .filter((_, i) => i % 4 === 0)
      .slice(0, spec.crossChecks)
      .forEach((st) => taken.push(addReading(ctxB, st, fluxgate, 'magnitude', { unitPreference: 'gauss', notes: 'Cross-check of tablet 1.' }).readingId));
    taken
      .filter((readingId) => !rejected.includes(readingId))
      .forEach((readingId, i) =>
        decisionRows.push({
          id: id(`survey:${plan.key}:decision:${i}`),
          organisationId,
          changeSeq: 0,
          surveyId,
          fieldReadingId: readingId,
          verdict: 'accepted',
          reviewerUserId: user('reviewer'),
          decidedAt: new Date(Date.parse(spec.decisionsFrom) + i * 20_000),
        }),
      );
  };

  // --- 2025: signed off. Two surveyors; the ECR tool was not installed yet. -------------------------------------------
  signedOffSurvey({
    plan: {
      key: '2025',
      name: '2025 annual fringe-field check',
      zoneSetKey: 'iec-ed3',
      startsOn: '2025-11-12',
      endsOn: '2025-11-21',
      onDate: '2025-11-12',
      spacingM: 4,
      levelKeys: ['b1', 'g', 'l1'],
    },
    notes: 'Annual check after the MR 1 software upgrade. Demo data.',
    prngSeed: 'harrowby-2025',
    adaLevels: ['b1', 'g'],
    bramLevels: ['l1'],
    adaWalk: { startedAt: '2025-11-12T08:30:00Z', endedAt: '2025-11-12T15:10:00Z' },
    bramWalk: { startedAt: '2025-11-13T09:00:00Z', endedAt: '2025-11-13T13:40:00Z' },
    outlier: { index: 7, scale: 2.6, notes: 'Probe resting on the steel trolley.', decisionNote: 'Probe was on a steel trolley; the repeat reading is used.', decidedAt: '2025-11-20T11:05:00Z' },
    crossChecks: 6,
    decisionsFrom: '2025-11-20T09:00:00Z',
    submittedAt: '2025-11-20T16:00:00Z',
    signedOffAt: '2025-11-21T10:30:00Z',
  });

  // --- 2026: open. Ada on the survey tablet (with the new ECR tool on level 1), Priya on her phone (the roof, and a
  // cross-check of the ground floor that finds one of Ada's readings off: the reviewer asks for it again).
  const s2026: SurveyPlan = {
    key: '2026',
    name: '2026 annual fringe-field check',
    zoneSetKey: 'iec-ed4',
    startsOn: '2026-11-17',
    endsOn: '2026-12-18',
    onDate: '2026-11-17',
    spacingM: 3.5,
    levelKeys: ['b1', 'g', 'l1', 'roof'],
  };
  surveyRows.push({
    id: id('survey:2026'),
    organisationId,
    changeSeq: 0,
    siteId,
    name: s2026.name,
    state: 'open',
    zoneSetId: id(`zone-set:${s2026.zoneSetKey}`),
    levelIds: s2026.levelKeys.map((key) => id(`level:${key}`)),
    startsOn: s2026.startsOn,
    endsOn: s2026.endsOn,
    species: ['electron', 'proton'],
    maxHarmonic: 3,
    notes: 'First check against edition 4 lines, and the first since the ECR etch tool arrived. Demo data.',
  });
  assign('2026', 'surveyor', 'surveyor');
  assign('2026', 'reviewer', 'reviewer');
  assign('2026', 'surveyor3', 'surveyor');
  {
    const prng = createPrng('harrowby-2026');
    const walkId = id('survey:2026:walk:ada');
    const phoneWalkId = id('survey:2026:walk:priya');
    walkRows.push(
      {
        id: walkId,
        organisationId,
        changeSeq: 0,
        surveyId: id('survey:2026'),
        surveyorUserId: user('surveyor'),
        deviceId: 'demo-tablet-01',
        deviceLabel: 'Survey tablet 1',
        startedAt: new Date('2026-11-17T08:15:00Z'),
      },
      {
        id: phoneWalkId,
        organisationId,
        changeSeq: 0,
        surveyId: id('survey:2026'),
        surveyorUserId: user('surveyor3'),
        deviceId: 'demo-phone-12',
        deviceLabel: 'Priya’s phone',
        startedAt: new Date('2026-11-17T13:30:00Z'),
        endedAt: new Date('2026-11-17T15:05:00Z'),
      },
    );
    const ctx: ReadingContext = { survey: s2026, walkId, userKey: 'surveyor', clock: { atMs: Date.parse('2026-11-17T08:15:00Z') }, prng };
    const phoneCtx: ReadingContext = { survey: s2026, walkId: phoneWalkId, userKey: 'surveyor3', clock: { atMs: Date.parse('2026-11-17T13:30:00Z') }, prng };
    const ecr = HARROWBY_SOURCES.find((s) => s.key === 'ecr-coils')!;
    // Stations at the etch tool's access ports, where the electron line sits near 2.45 GHz.
    const ecrPorts: StationSpot[] = [
      { roomKey: 'etch', xM: ecr.xM - 0.5, yM: ecr.yM },
      { roomKey: 'etch', xM: ecr.xM + 0.5, yM: ecr.yM },
      { roomKey: 'etch', xM: ecr.xM, yM: ecr.yM - 0.8 },
    ];
    const all: { stationId: string; spot: StationSpot; levelKey: string; trueB: Vec3; readingId: string; fieldT: number }[] = [];
    let steelDoorReading: string | null = null;
    for (const levelKey of ['b1', 'g', 'l1']) {
      const placedStations = placeStations(s2026, levelKey, walkId, 'surveyor', levelKey === 'l1' ? ecrPorts : []);
      placedStations.forEach((st, i) => {
        // Every fifth reading is the meter's |B| display instead of the three components.
        const mode: ReadingMode = (all.length + 1) % 5 === 0 ? 'magnitude' : 'vector';
        // The first gamma-camera station is read with the probe against the steel door frame, which pulls
        // the local field up (modelled as a scale on the true field): Priya's cross-check disagrees with it.
        const atSteelDoor = steelDoorReading === null && st.spot.roomKey === 'gamma';
        const taken = addReading(ctx, st, hall, mode, { unitPreference: 'si', backgroundT: all.length === 0 ? 48.8e-6 : undefined, scale: atSteelDoor ? STEEL_DOOR_SCALE : undefined });
        if (atSteelDoor) steelDoorReading = taken.readingId;
        all.push({ ...st, ...taken });
        if (i % 9 === 4) addReading(ctx, st, hall, 'vector', { unitPreference: 'si', notes: 'Repeat.' });
      });
    }
    // Priya: the roof on the fluxgate (Earth's field only, far from every magnet), then a cross-check of some
    // of Ada's ground-floor stations within the fluxgate's range, the gamma-camera door first.
    for (const st of placeStations(s2026, 'roof', phoneWalkId, 'surveyor3')) {
      const taken = addReading(phoneCtx, st, fluxgate, 'magnitude', { unitPreference: 'gauss' });
      all.push({ ...st, ...taken });
    }
    const ground = all.filter((r) => r.levelKey === 'g' && Math.hypot(...r.trueB) < FLUXGATE_RANGE_T);
    const crossChecked = [ground.find((r) => r.readingId === steelDoorReading)!, ...ground.filter((r) => r.readingId !== steelDoorReading).filter((_, i) => i % 5 === 2).slice(0, 4)];
    for (const st of crossChecked) addReading(phoneCtx, st, fluxgate, 'magnitude', { unitPreference: 'gauss', notes: 'Cross-check of tablet 1.' });

    all.slice(0, 8).forEach((r, i) =>
      decisionRows.push({
        id: id(`survey:2026:decision:${i}`),
        organisationId,
        changeSeq: 0,
        surveyId: id('survey:2026'),
        fieldReadingId: r.readingId,
        verdict: 'accepted',
        reviewerUserId: user('reviewer'),
        decidedAt: new Date(Date.parse('2026-11-18T09:00:00Z') + i * 30_000),
      }),
    );
    decisionRows.push({
      id: id('survey:2026:decision:remeasure'),
      organisationId,
      changeSeq: 0,
      surveyId: id('survey:2026'),
      fieldReadingId: steelDoorReading!,
      verdict: 'remeasure',
      note: 'Disagrees with the phone cross-check: taken against the steel door frame? Please repeat 30 cm into the room.',
      reviewerUserId: user('reviewer'),
      decidedAt: new Date('2026-11-18T09:30:00Z'),
    });

    // Sweeps: peak markers placed at the electron cyclotron line of the station's reading (cold line, n = 1),
    // plus invented other peaks; levels are invented.
    const nearest = (roomKey: string, xM: number, yM: number) =>
      all.filter((r) => r.spot.roomKey === roomKey).sort((a, b) => Math.hypot(a.spot.xM - xM, a.spot.yM - yM) - Math.hypot(b.spot.xM - xM, b.spot.yM - yM))[0]!;
    const lamp = HARROWBY_EMITTERS.find((e) => e.key === 'corridor-lamps')!;
    const gauge = HARROWBY_EMITTERS.find((e) => e.key === 'ion-gauge')!;
    const sweepPlans: { key: string; at: (typeof all)[number]; startHz: number; stopHz: number; rbwHz: number; detector: 'peak' | 'quasi_peak'; antenna: string; extraPeaks: PeakMarker[]; lineLevelDbm: number; notes: string }[] = [
      {
        key: 'etch',
        at: all.find((r) => r.spot.roomKey === 'etch' && r.spot.xM === ecr.xM - 0.5)!,
        startHz: 2.3e9,
        stopHz: 2.6e9,
        rbwHz: 100e3,
        detector: 'peak',
        antenna: 'log-periodic',
        extraPeaks: [{ frequencyHz: 2.45e9, levelDbm: -27.5 }],
        lineLevelDbm: -61.3,
        notes: 'Tool running. The 2.45 GHz peak is the magnetron itself.',
      },
      {
        key: 'vault',
        at: nearest('vault', gauge.xM, gauge.yM),
        startHz: 1e6,
        stopHz: 30e6,
        rbwHz: 9e3,
        detector: 'quasi_peak',
        antenna: 'loop',
        extraPeaks: [],
        lineLevelDbm: -74,
        notes: 'Beside the ion gauge, cyclotron at field, no beam.',
      },
      {
        key: 'corridor',
        at: nearest('corridor-g', lamp.xM, lamp.yM),
        startHz: 1e6,
        stopHz: 30e6,
        rbwHz: 9e3,
        detector: 'quasi_peak',
        antenna: 'loop',
        extraPeaks: [{ frequencyHz: 7.05e6, levelDbm: -88.2 }],
        lineLevelDbm: -81.6,
        notes: 'Under the corridor lighting, lamps on.',
      },
    ];
    for (const sp of sweepPlans) {
      ctx.clock.atMs += 5 * 60_000;
      const lineHz = cyclotronFrequencyHz('electron', sp.at.fieldT);
      const sweepPeaks = [{ frequencyHz: Number(lineHz.toPrecision(6)), levelDbm: sp.lineLevelDbm }, ...sp.extraPeaks].sort((a, b) => a.frequencyHz - b.frequencyHz);
      const traceSpec = DEMO_TRACES[sp.key];
      // The trace file: made from the same markers, "uploaded" by the surveyor a minute after the sweep.
      const trace = traceSpec
        ? demoTraceRows(organisationId, id(`survey:2026:sweep:${sp.key}`), { startHz: sp.startHz, stopHz: sp.stopHz, rbwHz: sp.rbwHz, peaks: sweepPeaks }, traceSpec, new Date(ctx.clock.atMs + 60_000), user('surveyor'))
        : null;
      if (trace) set.attachments.push(trace.attachment);
      sweepRows.push({
        id: id(`survey:2026:sweep:${sp.key}`),
        organisationId,
        changeSeq: 0,
        surveyId: id('survey:2026'),
        stationId: sp.at.stationId,
        walkId,
        analyserId: id('instrument:analyser'),
        antennaId: id(`instrument:${sp.antenna}`),
        surveyorUserId: user('surveyor'),
        measuredAt: new Date(ctx.clock.atMs),
        startHz: sp.startHz,
        stopHz: sp.stopHz,
        rbwHz: sp.rbwHz,
        vbwHz: sp.rbwHz * 3,
        referenceLevelDbm: -20,
        attenuationDb: 10,
        detector: sp.detector,
        peaks: sweepPeaks,
        ...(trace?.sweepColumns ?? {}),
        heightM: 1,
        notes: sp.notes,
      });
    }
  }

  // --- 2024: signed off. Fewer levels (the NMR magnet and the ECR tool's level were not walked); the ECR tool
  // did not exist yet, the NMR magnet was there (installedOn dates in demo-data.ts).
  signedOffSurvey({
    plan: {
      key: '2024',
      name: '2024 annual fringe-field check',
      zoneSetKey: 'iec-ed3',
      startsOn: '2024-11-13',
      endsOn: '2024-11-22',
      onDate: '2024-11-13',
      spacingM: 5,
      levelKeys: ['b1', 'g'],
    },
    notes: 'Annual check of the imaging wing and the cyclotron level. Demo data.',
    prngSeed: 'harrowby-2024',
    adaLevels: ['b1', 'g'],
    bramLevels: [],
    adaWalk: { startedAt: '2024-11-13T08:45:00Z', endedAt: '2024-11-13T12:20:00Z' },
    bramWalk: { startedAt: '2024-11-14T09:10:00Z', endedAt: '2024-11-14T12:30:00Z' },
    outlier: null,
    crossChecks: 4,
    decisionsFrom: '2024-11-21T09:00:00Z',
    submittedAt: '2024-11-21T15:30:00Z',
    signedOffAt: '2024-11-22T11:00:00Z',
  });

  set.add('surveys', surveys, surveyRows);
  set.add('survey_assignments', surveyAssignments, assignmentRows);
  set.add('walks', walks, walkRows);
  set.add('stations', stations, stationRows);
  set.add('field_readings', fieldReadings, readingRows);
  set.add('sweeps', sweeps, sweepRows);
  set.add('decisions', decisions, decisionRows);
  set.afterWrite.push((tx) => finishHarrowby(tx, organisationId, people, signOffs));
  return set;
}

interface SignOff {
  surveyKey: string;
  surveyId: string;
  signedOffAt: Date;
}

/** When the flag job would have run over each survey's readings (invented). */
const FLAGS_COMPUTED_AT: Record<string, string> = {
  '2024': '2024-11-21T15:45:00Z',
  '2025': '2025-11-20T16:15:00Z',
  '2026': '2026-11-17T15:10:00Z',
};

const findFlag = (rows: FlagRow[], what: string, test: (f: FlagRow) => boolean): FlagRow => {
  const found = rows.find(test);
  if (!found) throw new Error(`The demo expects a flag for ${what}; the EMC computation raised: ${rows.map((f) => f.fingerprint).join(', ')}`);
  return found;
};

/**
 * After the rows are written: the flags of every survey, computed by the EMC service; a few of them worked
 * by the EMC engineer; then the sign-off of the two closed surveys (their reports cover their flags).
 */
async function finishHarrowby(tx: Tx, organisationId: string, people: UserIds, signOffs: SignOff[]): Promise<void> {
  const id = (name: string) => demoId(`${HARROWBY.key}:${name}`);
  const emc = people.get('emc')!;
  const roomOf = (key: string) => (f: FlagRow) => f.roomId === id(`room:${key}`);
  const bandOf = (key: string) => (f: FlagRow) => f.watchBandId === id(`watch-band:${key}`);

  for (const s of signOffs) {
    const computed = await computeDemoFlags(tx, organisationId, s.surveyId, new Date(FLAGS_COMPUTED_AT[s.surveyKey]!));
    if (s.surveyKey === '2025') {
      // Worked and closed before the sign-off, so the signed report carries the resolution.
      const rfid = findFlag(computed, 'ISM 13.56 MHz in the staff room', (f) => roomOf('staff')(f) && bandOf('ism-13m56')(f) && f.harmonic === 2);
      const acked = await acknowledgeDemoFlag(tx, rfid, emc, 'Asked estates to test the RFID door readers by the staff room with MR 1 at field. Demo data.', new Date('2025-11-20T16:40:00Z'));
      await resolveDemoFlag(tx, acked, emc, 'Door readers tested with MR 1 at field: no missed or false reads. Closed. Demo data.', new Date('2025-11-21T09:15:00Z'));
    }
    await signOffDemoSurvey(tx, organisationId, s.surveyId, people.get('reviewer')!, s.signedOffAt);
  }

  // The open survey: most flags still open, one acknowledged (being worked on), one resolved.
  const open = await computeDemoFlags(tx, organisationId, id('survey:2026'), new Date(FLAGS_COMPUTED_AT['2026']!));
  // (The etch room's ISM 2.4 GHz flag, the demo's headline, is left open for the EMC engineer to work.)
  const etchGps = findFlag(open, 'GPS L1 in the etch laboratory', (f) => roomOf('etch')(f) && bandOf('gps-l1')(f) && f.harmonic === 1);
  await acknowledgeDemoFlag(tx, etchGps, emc, 'Radiopharmacy told (their dispatch clock has a GPS timing receiver); a check of its lock with the etch tool running is booked. Demo data.', new Date('2026-11-18T14:20:00Z'));
  const mrReceive = findFlag(open, 'the MR 1 receive band in the scanner room', (f) => roomOf('mr1')(f) && bandOf('mr1-receive')(f) && f.harmonic === 1);
  const acked = await acknowledgeDemoFlag(tx, mrReceive, emc, 'Asked the MR physicist for the scanner’s noise check. Demo data.', new Date('2026-11-18T14:35:00Z'));
  await resolveDemoFlag(tx, acked, emc, 'No emitter in the scanner room, and the weekly noise check shows nothing at the predicted line: the line is possible, nothing emits it. Demo data.', new Date('2026-11-19T10:05:00Z'));
}

function buildKestrel(organisationId: string): RowSet {
  const set = new RowSet();
  siteRows(set, organisationId, KESTREL.key, KESTREL_SITE, KESTREL_LEVELS, KESTREL_SOURCES);
  return set;
}

function summarise(set: RowSet): Record<string, number> {
  return Object.fromEntries(set.batches.map((b) => [b.entity, set.count(b.entity)]));
}

async function seedOrganisation(
  tx: Tx,
  spec: { id: string; key: string; name: string; people: readonly PersonSpec[] },
  hashes: Map<string, string>,
  build: (organisationId: string, people: UserIds) => RowSet,
): Promise<void> {
  await tx.insert(organisations).values({ id: spec.id, name: spec.name });
  const people = await insertPeople(tx, spec.id, spec.people, hashes);
  const set = build(spec.id, people);
  await writeRowSet(tx, spec.id, set);
  for (const step of set.afterWrite) await step(tx);
  await recordAudit(tx, {
    organisationId: spec.id,
    actorUserId: null,
    action: 'seed.demo',
    entity: 'organisations',
    entityId: spec.id,
    before: null,
    after: { name: spec.name, rows: summarise(set), note: 'Invented demo data.' },
  });
}

async function organisationExists(db: Db | Tx, organisationId: string): Promise<boolean> {
  const rows = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.id, organisationId));
  return rows.length > 0;
}

async function lookUpResult(db: Db, created: boolean): Promise<DemoSeedResult> {
  const rows = await db
    .select({ id: users.id, email: users.email, role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.organisationId, HARROWBY_ORG_ID));
  const result = {} as Record<Role, string>;
  for (const person of HARROWBY.people) {
    if (person.key !== person.role) continue; // the second surveyor is not the role's representative
    const row = rows.find((r) => r.email.toLowerCase() === person.email && r.role === person.role);
    if (!row) throw new Error(`The demo organisation exists, but its ${person.role} user ${person.email} is missing or has another role.`);
    result[person.role] = row.id;
  }
  return { organisationId: HARROWBY_ORG_ID, users: result, created };
}

/** Seeds the demo organisations into a migrated database; a no-op for an organisation already there. */
export async function seedDemo(db: Db): Promise<DemoSeedResult> {
  const specs = [
    { id: HARROWBY_ORG_ID, key: HARROWBY.key, name: HARROWBY.name, people: HARROWBY.people, build: buildHarrowby },
    { id: KESTREL_ORG_ID, key: KESTREL.key, name: KESTREL.name, people: KESTREL.people, build: (orgId: string) => buildKestrel(orgId) },
  ];
  const missing: typeof specs = [];
  for (const spec of specs) if (!(await organisationExists(db, spec.id))) missing.push(spec);
  if (missing.length === 0) return lookUpResult(db, false);

  // Hash outside the transaction (scrypt is deliberately slow), and once: every demo account shares the
  // published demo password, so a salt per account would protect nothing and cost start-up time.
  const demoHash = await hashPassword(DEMO_PASSWORD);
  const hashes = new Map(missing.flatMap((s) => s.people).map((p) => [p.email, demoHash] as const));

  let created = false;
  await db.transaction(async (tx) => {
    await tx.execute(sql`SELECT pg_advisory_xact_lock(${SEED_LOCK_KEY})`);
    for (const spec of missing) {
      if (await organisationExists(tx, spec.id)) continue; // another seeder got here first
      await seedOrganisation(tx, spec, hashes, spec.build);
      created = true;
    }
  });
  return lookUpResult(db, created);
}
