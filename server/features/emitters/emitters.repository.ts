import { and, asc, eq, inArray, max } from 'drizzle-orm';
import type { AuditContext } from '../../lib/audit-context';
import type { Db } from '../../db/client';
import { emitters, fieldReadings, levels, rooms, sites, stations } from '../../db/schema';
import { createSynced, tombstoneSynced, updateSynced } from '../../db/synced-write';

export type EmitterRow = typeof emitters.$inferSelect;
export type EmitterValues = Omit<typeof emitters.$inferInsert, 'id' | 'organisationId' | 'changeSeq' | 'revision'>;
export interface EmitterPlace {
  siteId: string;
  levelId: string;
  roomName: string;
}
export interface EmitterWithPlace {
  row: EmitterRow;
  place: EmitterPlace;
}

export function createEmittersRepository(db: Db) {
  const withPlace = () =>
    db
      .select({ row: emitters, siteId: levels.siteId, levelId: levels.id, roomName: rooms.name })
      .from(emitters)
      .innerJoin(rooms, and(eq(rooms.id, emitters.roomId), eq(rooms.organisationId, emitters.organisationId)))
      .innerJoin(levels, and(eq(levels.id, rooms.levelId), eq(levels.organisationId, rooms.organisationId)));
  const shape = (r: { row: EmitterRow; siteId: string; levelId: string; roomName: string }): EmitterWithPlace => ({
    row: r.row,
    place: { siteId: r.siteId, levelId: r.levelId, roomName: r.roomName },
  });

  return {
    async siteExists(organisationId: string, siteId: string): Promise<boolean> {
      const [row] = await db
        .select({ id: sites.id })
        .from(sites)
        .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId), eq(sites.deleted, false)))
        .limit(1);
      return Boolean(row);
    },
    /** The live room's place, or null. */
    async roomPlace(organisationId: string, roomId: string): Promise<EmitterPlace | null> {
      const [row] = await db
        .select({ siteId: levels.siteId, levelId: levels.id, roomName: rooms.name })
        .from(rooms)
        .innerJoin(levels, and(eq(levels.id, rooms.levelId), eq(levels.organisationId, rooms.organisationId)))
        .where(and(eq(rooms.organisationId, organisationId), eq(rooms.id, roomId), eq(rooms.deleted, false)))
        .limit(1);
      return row ?? null;
    },
    async list(organisationId: string, siteId: string): Promise<EmitterWithPlace[]> {
      const rows = await withPlace()
        .where(and(eq(emitters.organisationId, organisationId), eq(levels.siteId, siteId), eq(emitters.deleted, false), eq(rooms.deleted, false)))
        .orderBy(asc(emitters.name), asc(emitters.id));
      return rows.map(shape);
    },
    async find(organisationId: string, emitterId: string): Promise<EmitterWithPlace | null> {
      const [row] = await withPlace()
        .where(and(eq(emitters.organisationId, organisationId), eq(emitters.id, emitterId), eq(emitters.deleted, false)))
        .limit(1);
      return row ? shape(row) : null;
    },
    /** Highest |B| (T) read at any live station in each room, from live readings. */
    async maxFieldByRoom(organisationId: string, roomIds: string[]): Promise<Map<string, number>> {
      if (roomIds.length === 0) return new Map();
      const rows = await db
        .select({ roomId: stations.roomId, fieldT: max(fieldReadings.fieldT) })
        .from(fieldReadings)
        .innerJoin(stations, and(eq(stations.id, fieldReadings.stationId), eq(stations.organisationId, fieldReadings.organisationId)))
        .where(and(eq(fieldReadings.organisationId, organisationId), inArray(stations.roomId, roomIds), eq(stations.deleted, false), eq(fieldReadings.deleted, false)))
        .groupBy(stations.roomId);
      return new Map(rows.filter((r) => r.roomId && r.fieldT !== null).map((r) => [r.roomId!, Number(r.fieldT)]));
    },
    async create(organisationId: string, values: EmitterValues, ctx: AuditContext): Promise<EmitterRow> {
      return db.transaction((tx) => createSynced(tx, emitters, 'emitters', organisationId, values, ctx));
    },
    async update(before: EmitterRow, patch: Partial<EmitterValues>, ctx: AuditContext): Promise<EmitterRow> {
      return db.transaction((tx) => updateSynced(tx, emitters, 'emitters', before, patch, ctx));
    },
    async remove(before: EmitterRow, ctx: AuditContext): Promise<void> {
      await db.transaction((tx) => tombstoneSynced(tx, emitters, 'emitters', before, ctx));
    },
  };
}
export type EmittersRepository = ReturnType<typeof createEmittersRepository>;
