import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

const RoomDeleteResultSchema = z.object({ stationsReassigned: z.number().int() });

export function deleteRoom(organisationId: string, roomId: string) {
  return apiRequest(`${orgPath(organisationId)}/rooms/${encodeURIComponent(roomId)}`, { method: 'DELETE', schema: RoomDeleteResultSchema });
}

export function useDeleteRoom(organisationId: string, siteId: string, levelId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (roomId: string) => deleteRoom(organisationId, roomId),
    meta: { toastErrors: true },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: siteSetupKeys.rooms(organisationId, siteId, levelId) }),
  });
}
