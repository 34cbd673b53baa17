/**
 * The demo seed: the invented "Harrowby Bridge Hospital & Research Campus" of DESIGN.md §7, plus a second,
 * unrelated organisation ("Kestrel Point Physics Lab") so that organisation isolation can be seen.
 *
 * EVERYTHING HERE IS MADE UP: people, e-mail addresses, sites, plans, magnets, serial numbers, dates and
 * every reading. The readings come from a point-dipole model of the invented magnets (Jackson,
 * Classical Electrodynamics, 3rd ed., §5.6, via shared/physics/dipole.ts) plus an invented Earth field
 * and seeded measurement noise, so every run makes the same numbers.
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

  // --- 2025: signed off. Two surveyors; the ECR tool was not installed yet. -------------------------------------------
  const s2025: SurveyPlan = {
    key: '2025',
    name: '2025 annual fringe-field check',
    zoneSetKey: 'iec-ed3',
    startsOn: '2025-11-12',
    endsOn: '2025-11-21',
    onDate: '2025-11-12',
    spacingM: 4,
    levelKeys: ['b1', 'g', 'l1'],
  };
  surveyRows.push({
    id: id('survey:2025'),
    organisationId,
    changeSeq: 0,
    siteId,
    name: s2025.name,
    state: 'signed_off',
    zoneSetId: id(`zone-set:${s2025.zoneSetKey}`),
    levelIds: s2025.levelKeys.map((key) => id(`level:${key}`)),
    startsOn: s2025.startsOn,
    endsOn: s2025.endsOn,
    species: ['electron', 'proton'],
    maxHarmonic: 3,
    submittedAt: new Date('2025-11-20T16:00:00Z'),
    submittedByUserId: user('reviewer'),
    signedOffAt: new Date('2025-11-21T10:30:00Z'),
    signedOffByUserId: user('reviewer'),
    notes: 'Annual check after the MR 1 software upgrade. Demo data.',
  });
  assign('2025', 'surveyor', 'surveyor');
  assign('2025', 'surveyor2', 'surveyor');
  assign('2025', 'reviewer', 'reviewer');
  {
    const prng = createPrng('harrowby-2025');
    const walkA = id('survey:2025:walk:ada');
    const walkB = id('survey:2025:walk:bram');
    walkRows.push(
      { id: walkA, organisationId, changeSeq: 0, surveyId: id('survey:2025'), surveyorUserId: user('surveyor'), deviceId: 'demo-tablet-01', deviceLabel: 'Survey tablet 1', startedAt: new Date('2025-11-12T08:30:00Z'), endedAt: new Date('2025-11-12T15:10:00Z') },
      { id: walkB, organisationId, changeSeq: 0, surveyId: id('survey:2025'), surveyorUserId: user('surveyor2'), deviceId: 'demo-phone-07', deviceLabel: 'Bram’s phone', startedAt: new Date('2025-11-13T09:00:00Z'), endedAt: new Date('2025-11-13T13:40:00Z') },
    );
    const ctxA: ReadingContext = { survey: s2025, walkId: walkA, userKey: 'surveyor', clock: { atMs: Date.parse('2025-11-12T08:30:00Z') }, prng };
    const ctxB: ReadingContext = { survey: s2025, walkId: walkB, userKey: 'surveyor2', clock: { atMs: Date.parse('2025-11-13T09:00:00Z') }, prng };
    const groundStations: { stationId: string; trueB: Vec3 }[] = [];
    const taken: string[] = [];
    for (const levelKey of ['b1', 'g']) {
      const placedStations = placeStations(s2025, levelKey, walkA, 'surveyor');
      placedStations.forEach((st, i) => {
        const first = taken.length === 0;
        taken.push(addReading(ctxA, st, hall, 'vector', { unitPreference: 'si', backgroundT: first ? 48.8e-6 : undefined }).readingId);
        if (levelKey === 'g') groundStations.push(st);
        if (levelKey === 'g' && i === 7) {
          // An outlier the reviewer rejected, then the station measured again.
          const bad = addReading(ctxA, st, hall, 'vector', { unitPreference: 'si', scale: 2.6, notes: 'Probe resting on the steel trolley.' });
          decisionRows.push({
            id: id('survey:2025:decision:rejected'),
            organisationId,
            changeSeq: 0,
            surveyId: id('survey:2025'),
            fieldReadingId: bad.readingId,
            verdict: 'rejected',
            note: 'Probe was on a steel trolley; the repeat reading is used.',
            reviewerUserId: user('reviewer'),
            decidedAt: new Date('2025-11-20T11:05:00Z'),
          });
          taken.push(addReading(ctxA, st, hall, 'vector', { unitPreference: 'si', notes: 'Repeat, trolley moved away.' }).readingId);
        }
      });
    }
    for (const st of placeStations(s2025, 'l1', walkB, 'surveyor2')) {
      taken.push(addReading(ctxB, st, fluxgate, 'magnitude', { unitPreference: 'gauss' }).readingId);
    }
    // Bram repeats a few of Ada's ground-floor stations (within the fluxgate's range), giving repeat groups across walks.
    groundStations
      .filter((st) => Math.hypot(...st.trueB) < 1.5e-3)
      .filter((_, i) => i % 4 === 0)
      .slice(0, 6)
      .forEach((st) => taken.push(addReading(ctxB, st, fluxgate, 'magnitude', { unitPreference: 'gauss', notes: 'Cross-check of tablet 1.' }).readingId));
    const rejected = new Set(decisionRows.map((d) => d.fieldReadingId));
    taken
      .filter((readingId) => !rejected.has(readingId))
      .forEach((readingId, i) =>
        decisionRows.push({
          id: id(`survey:2025:decision:${i}`),
          organisationId,
          changeSeq: 0,
          surveyId: id('survey:2025'),
          fieldReadingId: readingId,
          verdict: 'accepted',
          reviewerUserId: user('reviewer'),
          decidedAt: new Date(Date.parse('2025-11-20T09:00:00Z') + i * 20_000),
        }),
      );
  }

  // --- 2026: open. One surveyor so far, with the new ECR tool on level 1. --------------------------------------------
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
  {
    const prng = createPrng('harrowby-2026');
    const walkId = id('survey:2026:walk:ada');
    walkRows.push({
      id: walkId,
      organisationId,
      changeSeq: 0,
      surveyId: id('survey:2026'),
      surveyorUserId: user('surveyor'),
      deviceId: 'demo-tablet-01',
      deviceLabel: 'Survey tablet 1',
      startedAt: new Date('2026-11-17T08:15:00Z'),
    });
    const ctx: ReadingContext = { survey: s2026, walkId, userKey: 'surveyor', clock: { atMs: Date.parse('2026-11-17T08:15:00Z') }, prng };
    const ecr = HARROWBY_SOURCES.find((s) => s.key === 'ecr-coils')!;
    // Stations at the etch tool's access ports, where the electron line sits near 2.45 GHz.
    const ecrPorts: StationSpot[] = [
      { roomKey: 'etch', xM: ecr.xM - 0.5, yM: ecr.yM },
      { roomKey: 'etch', xM: ecr.xM + 0.5, yM: ecr.yM },
      { roomKey: 'etch', xM: ecr.xM, yM: ecr.yM - 0.8 },
    ];
    const all: { stationId: string; spot: StationSpot; trueB: Vec3; readingId: string; fieldT: number }[] = [];
    for (const levelKey of s2026.levelKeys) {
      const placedStations = placeStations(s2026, levelKey, walkId, 'surveyor', levelKey === 'l1' ? ecrPorts : []);
      placedStations.forEach((st, i) => {
        // Every fifth reading is the meter's |B| display instead of the three components.
        const mode: ReadingMode = (all.length + 1) % 5 === 0 ? 'magnitude' : 'vector';
        const taken = addReading(ctx, st, hall, mode, { unitPreference: 'si', backgroundT: all.length === 0 ? 48.8e-6 : undefined });
        all.push({ ...st, ...taken });
        if (i % 9 === 4) addReading(ctx, st, hall, 'vector', { unitPreference: 'si', notes: 'Repeat.' });
      });
    }
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
    const gammaStation = all.find((r) => r.spot.roomKey === 'gamma')!;
    decisionRows.push({
      id: id('survey:2026:decision:remeasure'),
      organisationId,
      changeSeq: 0,
      surveyId: id('survey:2026'),
      fieldReadingId: gammaStation.readingId,
      verdict: 'remeasure',
      note: 'Taken against the steel door frame; please repeat 30 cm into the room.',
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

  set.add('surveys', surveys, surveyRows);
  set.add('survey_assignments', surveyAssignments, assignmentRows);
  set.add('walks', walks, walkRows);
  set.add('stations', stations, stationRows);
  set.add('field_readings', fieldReadings, readingRows);
  set.add('sweeps', sweeps, sweepRows);
  set.add('decisions', decisions, decisionRows);
  return set;
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
