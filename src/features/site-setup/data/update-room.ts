import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { RoomWriteResultSchema, type RoomUpdateSchema } from '@shared/schemas/room';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type RoomUpdateInput = z.input<typeof RoomUpdateSchema>;

export function updateRoom(organisationId: string, roomId: string, body: RoomUpdateInput) {
  return apiRequest(`${orgPath(organisationId)}/rooms/${encodeURIComponent(roomId)}`, { method: 'PATCH', body, schema: RoomWriteResultSchema });
}

export function useUpdateRoom(organisationId: string, siteId: string, levelId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ roomId, body }: { roomId: string; body: RoomUpdateInput }) => updateRoom(organisationId, roomId, body),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: siteSetupKeys.rooms(organisationId, siteId, levelId) }),
        queryClient.invalidateQueries({ queryKey: siteSetupKeys.emitters(organisationId, siteId) }),
      ]),
  });
}
