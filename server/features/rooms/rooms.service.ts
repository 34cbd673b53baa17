/**
 * Rooms on a level. After every room write (create, outline edit, delete) the stations of the level's
 * open surveys are re-assigned to the room that contains them (shared/plans/polygon.ts roomForPoint:
 * the smallest containing room wins where outlines overlap); the answer says how many moved.
 */
import type { Room, RoomCreate, RoomUpdate } from '../../../shared/schemas/room';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import type { RoomsRepository } from './rooms.repository';

export function createRoomsService(repo: RoomsRepository) {
  return {
    async list(organisationId: string, levelId: string): Promise<Room[]> {
      if (!(await repo.findLevel(organisationId, levelId))) throw notFound('That level');
      return repo.list(organisationId, levelId);
    },
    async create(organisationId: string, levelId: string, input: RoomCreate, ctx: AuditContext) {
      const result = await repo.create(organisationId, levelId, input, ctx);
      if (!result) throw notFound('That level');
      return result;
    },
    async update(organisationId: string, roomId: string, patch: RoomUpdate, ctx: AuditContext) {
      const result = await repo.update(organisationId, roomId, patch, ctx);
      if (!result) throw notFound('That room');
      return result;
    },
    async remove(organisationId: string, roomId: string, ctx: AuditContext) {
      const result = await repo.remove(organisationId, roomId, ctx);
      if (result === 'has_emitters') throw new AppError('CONFLICT', 'Emitters are still placed in this room: delete or move them first.');
      if (!result) throw notFound('That room');
      return result;
    },
  };
}
export type RoomsService = ReturnType<typeof createRoomsService>;
