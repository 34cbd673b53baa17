import { Router } from 'express';
import { RoomCreateSchema, RoomParamsSchema, RoomUpdateSchema } from '../../../shared/schemas/room';
import { LevelParamsSchema } from '../../../shared/schemas/site';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { RoomsService } from './rooms.service';

const ListInput = { params: LevelParamsSchema };
const CreateInput = { params: LevelParamsSchema, body: RoomCreateSchema };
const UpdateInput = { params: RoomParamsSchema, body: RoomUpdateSchema };
const OneInput = { params: RoomParamsSchema };

/** Mounted at /api. */
export default function roomsRouter(deps: { rooms: RoomsService; guards: AuthGuards }): Router {
  const { rooms, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const write = [guards.requireUser, guards.requireMember(['admin', 'reviewer'])];

  router.get('/orgs/:orgId/levels/:levelId/rooms', ...read, validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ rooms: await rooms.list(params.orgId, params.levelId) });
  });

  router.post('/orgs/:orgId/levels/:levelId/rooms', ...write, validate(CreateInput), async (req, res) => {
    const { params, body } = validated(req, CreateInput);
    res.status(201).json(await rooms.create(params.orgId, params.levelId, body, auditContextOf(req)));
  });

  router.patch('/orgs/:orgId/rooms/:roomId', ...write, validate(UpdateInput), async (req, res) => {
    const { params, body } = validated(req, UpdateInput);
    res.json(await rooms.update(params.orgId, params.roomId, body, auditContextOf(req)));
  });

  router.delete('/orgs/:orgId/rooms/:roomId', ...write, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await rooms.remove(params.orgId, params.roomId, auditContextOf(req)));
  });

  return router;
}
