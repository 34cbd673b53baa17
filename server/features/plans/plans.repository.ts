import { and, eq, inArray, isNotNull, ne } from 'drizzle-orm';
import type { PlanCalibration } from '../../../shared/plans/calibration';
import { reprojectPoint } from '../../../shared/plans/calibration';
import type { AuditContext } from '../../lib/audit-context';
import type { Db, DbOrTx, Tx } from '../../db/client';
import { emitters, levels, plans, rooms, sources, stations, surveys } from '../../db/schema';
import { createSynced, tombstoneSynced, updateSynced } from '../../db/synced-write';

type PlanRow = typeof plans.$inferSelect;

export interface NewPlan {
  id: string;
  objectKey: string;
  deviceObjectKey: string | null;
  originalName: string | null;
  mime: string;
  byteSize: number;
  sha256: string;
  widthPx: number;
  heightPx: number;
}

export interface ReprojectionCounts {
  stations: number;
  rooms: number;
  sources: number;
  emitters: number;
  stationsKeptInClosedSurveys: number;
}

function calibrationOf(row: PlanRow): PlanCalibration | null {
  if (row.metresPerPixel === null || row.originXPx === null || row.originYPx === null) return null;
  return { metresPerPixel: row.metresPerPixel, originXPx: row.originXPx, originYPx: row.originYPx, northAngleDeg: row.northAngleDeg ?? 0 };
}

export function createPlansRepository(db: Db) {
  async function findLevel(q: DbOrTx, organisationId: string, levelId: string, lock = false) {
    const base = q
      .select()
      .from(levels)
      .where(and(eq(levels.organisationId, organisationId), eq(levels.id, levelId), eq(levels.deleted, false)))
      .limit(1);
    const [row] = lock ? await base.for('update') : await base;
    return row ?? null;
  }

  async function findPlan(q: DbOrTx, organisationId: string, planId: string, lock = false) {
    const base = q
      .select({ plan: plans, siteId: levels.siteId })
      .from(plans)
      .innerJoin(levels, and(eq(levels.id, plans.levelId), eq(levels.organisationId, plans.organisationId)))
      .where(and(eq(plans.organisationId, organisationId), eq(plans.id, planId), eq(plans.deleted, false)))
      .limit(1);
    const [row] = lock ? await base.for('update', { of: plans }) : await base;
    return row ?? null;
  }

  /** Moves everything placed on the level's plan so it keeps its pixel (see the plans service docblock). */
  async function reproject(tx: Tx, organisationId: string, levelId: string, from: PlanCalibration, to: PlanCalibration, ctx: AuditContext): Promise<ReprojectionCounts> {
    const move = (xM: number, yM: number) => reprojectPoint({ xM, yM }, from, to);
    const counts: ReprojectionCounts = { stations: 0, rooms: 0, sources: 0, emitters: 0, stationsKeptInClosedSurveys: 0 };

    const roomRows = await tx.select().from(rooms).where(and(eq(rooms.organisationId, organisationId), eq(rooms.levelId, levelId), eq(rooms.deleted, false)));
    for (const room of roomRows) {
      const polygon = room.polygon.map(([x, y]) => {
        const p = move(x, y);
        return [p.xM, p.yM] as [number, number];
      });
      await updateSynced(tx, rooms, 'rooms', room, { polygon }, ctx, { action: 'reproject' });
      counts.rooms += 1;
    }

    const sourceRows = await tx
      .select()
      .from(sources)
      .where(and(eq(sources.organisationId, organisationId), eq(sources.levelId, levelId), eq(sources.deleted, false), isNotNull(sources.xM)));
    for (const source of sourceRows) {
      const p = move(source.xM!, source.yM!);
      await updateSynced(tx, sources, 'sources', source, { xM: p.xM, yM: p.yM }, ctx, { action: 'reproject' });
      counts.sources += 1;
    }

    const roomIds = roomRows.map((r) => r.id);
    if (roomIds.length > 0) {
      const emitterRows = await tx
        .select()
        .from(emitters)
        .where(and(eq(emitters.organisationId, organisationId), inArray(emitters.roomId, roomIds), eq(emitters.deleted, false), isNotNull(emitters.xM)));
      for (const emitter of emitterRows) {
        const p = move(emitter.xM!, emitter.yM!);
        await updateSynced(tx, emitters, 'emitters', emitter, { xM: p.xM, yM: p.yM }, ctx, { action: 'reproject' });
        counts.emitters += 1;
      }
    }

    const stationRows = await tx
      .select({ station: stations, state: surveys.state })
      .from(stations)
      .innerJoin(surveys, and(eq(surveys.id, stations.surveyId), eq(surveys.organisationId, stations.organisationId)))
      .where(and(eq(stations.organisationId, organisationId), eq(stations.levelId, levelId), eq(stations.deleted, false)));
    for (const { station, state } of stationRows) {
      if (state !== 'open') {
        counts.stationsKeptInClosedSurveys += 1;
        continue;
      }
      const p = move(station.xM, station.yM);
      await updateSynced(tx, stations, 'stations', station, { xM: p.xM, yM: p.yM }, ctx, { action: 'reproject' });
      counts.stations += 1;
    }
    return counts;
  }

  return {
    findLevel: (organisationId: string, levelId: string) => findLevel(db, organisationId, levelId),
    findPlan: (organisationId: string, planId: string) => findPlan(db, organisationId, planId),

    /** Stores the new plan as the level's current one; earlier live plans of the level are tombstoned. */
    async insertPlan(organisationId: string, levelId: string, plan: NewPlan, ctx: AuditContext): Promise<{ plan: PlanRow; siteId: string } | null> {
      return db.transaction(async (tx) => {
        const level = await findLevel(tx, organisationId, levelId, true);
        if (!level) return null;
        const previous = await tx
          .select()
          .from(plans)
          .where(and(eq(plans.organisationId, organisationId), eq(plans.levelId, levelId), eq(plans.deleted, false), ne(plans.id, plan.id)));
        for (const old of previous) await tombstoneSynced(tx, plans, 'plans', old, ctx);
        const row = await createSynced(tx, plans, 'plans', organisationId, { ...plan, levelId }, ctx);
        return { plan: row, siteId: level.siteId };
      });
    },

    async calibrate(
      organisationId: string,
      planId: string,
      calibration: PlanCalibration,
      ctx: AuditContext,
    ): Promise<{ plan: PlanRow; siteId: string; counts: ReprojectionCounts; hadCalibration: boolean } | null> {
      return db.transaction(async (tx) => {
        const found = await findPlan(tx, organisationId, planId, true);
        if (!found) return null;
        const previous = calibrationOf(found.plan);
        const row = await updateSynced(
          tx,
          plans,
          'plans',
          found.plan,
          { metresPerPixel: calibration.metresPerPixel, originXPx: calibration.originXPx, originYPx: calibration.originYPx, northAngleDeg: calibration.northAngleDeg },
          ctx,
          { action: 'calibrate' },
        );
        const counts = previous
          ? await reproject(tx, organisationId, found.plan.levelId, previous, calibration, ctx)
          : { stations: 0, rooms: 0, sources: 0, emitters: 0, stationsKeptInClosedSurveys: 0 };
        return { plan: row, siteId: found.siteId, counts, hadCalibration: previous !== null };
      });
    },
  };
}
export type PlansRepository = ReturnType<typeof createPlansRepository>;
