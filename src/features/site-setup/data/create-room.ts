import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { RoomWriteResultSchema, type RoomCreateSchema } from '@shared/schemas/room';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type RoomCreateInput = z.input<typeof RoomCreateSchema>;

export function createRoom(organisationId: string, levelId: string, body: RoomCreateInput) {
  return apiRequest(`${orgPath(organisationId)}/levels/${encodeURIComponent(levelId)}/rooms`, { method: 'POST', body, schema: RoomWriteResultSchema });
}

export function useCreateRoom(organisationId: string, siteId: string, levelId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: RoomCreateInput) => createRoom(organisationId, levelId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: siteSetupKeys.rooms(organisationId, siteId, levelId) }),
  });
}
