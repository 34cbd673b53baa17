import { and, asc, eq } from 'drizzle-orm';
import { polygonAreaM2, roomForPoint } from '../../../shared/plans/polygon';
import type { Room, RoomCreate, RoomUpdate } from '../../../shared/schemas/room';
import type { AuditContext } from '../../lib/audit-context';
import type { Db, DbOrTx, Tx } from '../../db/client';
import { emitters, levels, rooms, stations, surveys } from '../../db/schema';
import { createSynced, tombstoneSynced, updateSynced } from '../../db/synced-write';

type RoomRow = typeof rooms.$inferSelect;

export function roomView(row: RoomRow): Room {
  return {
    id: row.id,
    levelId: row.levelId,
    name: row.name,
    use: row.use,
    sensitivity: row.sensitivity,
    polygonM: row.polygon,
    areaM2: polygonAreaM2(row.polygon),
    revision: row.revision,
    changeSeq: row.changeSeq,
    updatedAt: row.updatedAt.toISOString(),
  };
}

export function createRoomsRepository(db: Db) {
  async function findLevel(q: DbOrTx, organisationId: string, levelId: string, lock = false) {
    const base = q
      .select()
      .from(levels)
      .where(and(eq(levels.organisationId, organisationId), eq(levels.id, levelId), eq(levels.deleted, false)))
      .limit(1);
    const [row] = lock ? await base.for('update') : await base;
    return row ?? null;
  }

  async function findRoom(q: DbOrTx, organisationId: string, roomId: string) {
    const [row] = await q
      .select()
      .from(rooms)
      .where(and(eq(rooms.organisationId, organisationId), eq(rooms.id, roomId), eq(rooms.deleted, false)))
      .limit(1);
    return row ?? null;
  }

  /**
   * Puts every station of the level's OPEN surveys in the room that now contains it (smallest room where
   * outlines overlap; none outside every room). Stations of submitted or signed-off surveys keep theirs:
   * their report is fixed. Returns how many stations changed room.
   */
  async function reassignStations(tx: Tx, organisationId: string, levelId: string, ctx: AuditContext): Promise<number> {
    const outlines = (await tx.select().from(rooms).where(and(eq(rooms.organisationId, organisationId), eq(rooms.levelId, levelId), eq(rooms.deleted, false)))).map((r) => ({
      id: r.id,
      polygon: r.polygon,
    }));
    const rows = await tx
      .select({ station: stations })
      .from(stations)
      .innerJoin(surveys, and(eq(surveys.id, stations.surveyId), eq(surveys.organisationId, stations.organisationId)))
      .where(and(eq(stations.organisationId, organisationId), eq(stations.levelId, levelId), eq(stations.deleted, false), eq(surveys.state, 'open')));
    let changed = 0;
    for (const { station } of rows) {
      const roomId = roomForPoint(outlines, station.xM, station.yM)?.id ?? null;
      if (roomId === station.roomId) continue;
      await updateSynced(tx, stations, 'stations', station, { roomId }, ctx, { action: 'assign_room' });
      changed += 1;
    }
    return changed;
  }

  return {
    findLevel: (organisationId: string, levelId: string) => findLevel(db, organisationId, levelId),

    async list(organisationId: string, levelId: string): Promise<Room[]> {
      const rows = await db
        .select()
        .from(rooms)
        .where(and(eq(rooms.organisationId, organisationId), eq(rooms.levelId, levelId), eq(rooms.deleted, false)))
        .orderBy(asc(rooms.name), asc(rooms.id));
      return rows.map(roomView);
    },

    async create(organisationId: string, levelId: string, input: RoomCreate, ctx: AuditContext): Promise<{ room: Room; stationsReassigned: number } | null> {
      return db.transaction(async (tx) => {
        // The level lock serialises room writes on one level, so two reassignments cannot interleave.
        if (!(await findLevel(tx, organisationId, levelId, true))) return null;
        const row = await createSynced(tx, rooms, 'rooms', organisationId, { levelId, name: input.name, use: input.use ?? null, sensitivity: input.sensitivity, polygon: input.polygonM }, ctx);
        return { room: roomView(row), stationsReassigned: await reassignStations(tx, organisationId, levelId, ctx) };
      });
    },

    async update(organisationId: string, roomId: string, patch: RoomUpdate, ctx: AuditContext): Promise<{ room: Room; stationsReassigned: number } | null> {
      return db.transaction(async (tx) => {
        const current = await findRoom(tx, organisationId, roomId);
        if (!current) return null;
        await findLevel(tx, organisationId, current.levelId, true);
        const before = await findRoom(tx, organisationId, roomId);
        if (!before) return null;
        const { polygonM, ...rest } = patch;
        const row = await updateSynced(tx, rooms, 'rooms', before, { ...rest, ...(polygonM ? { polygon: polygonM } : {}) }, ctx);
        const stationsReassigned = polygonM ? await reassignStations(tx, organisationId, before.levelId, ctx) : 0;
        return { room: roomView(row), stationsReassigned };
      });
    },

    /** 'has_emitters' when live emitters still sit in the room. */
    async remove(organisationId: string, roomId: string, ctx: AuditContext): Promise<{ stationsReassigned: number } | null | 'has_emitters'> {
      return db.transaction(async (tx) => {
        const current = await findRoom(tx, organisationId, roomId);
        if (!current) return null;
        await findLevel(tx, organisationId, current.levelId, true);
        const before = await findRoom(tx, organisationId, roomId);
        if (!before) return null;
        const [emitter] = await tx
          .select({ id: emitters.id })
          .from(emitters)
          .where(and(eq(emitters.organisationId, organisationId), eq(emitters.roomId, roomId), eq(emitters.deleted, false)))
          .limit(1);
        if (emitter) return 'has_emitters';
        await tombstoneSynced(tx, rooms, 'rooms', before, ctx);
        return { stationsReassigned: await reassignStations(tx, organisationId, before.levelId, ctx) };
      });
    },
  };
}
export type RoomsRepository = ReturnType<typeof createRoomsRepository>;
