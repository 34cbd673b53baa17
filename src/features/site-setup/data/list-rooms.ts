import { queryOptions, useQuery } from '@tanstack/react-query';
import { RoomListSchema } from '@shared/schemas/room';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function listRooms(organisationId: string, levelId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/levels/${encodeURIComponent(levelId)}/rooms`, RoomListSchema, { signal });
}

export const roomsQueryOptions = (organisationId: string, siteId: string, levelId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.rooms(organisationId, siteId, levelId),
    queryFn: ({ signal }) => listRooms(organisationId, levelId, { signal }),
    enabled: organisationId !== '' && levelId !== '',
  });

export function useRooms(organisationId: string, siteId: string, levelId: string) {
  return useQuery(roomsQueryOptions(organisationId, siteId, levelId));
}
