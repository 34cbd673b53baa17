import { queryOptions, useQuery } from '@tanstack/react-query';
import { EmcRoomListSchema } from '@shared/schemas/emc';
import { api } from '@/lib/api';
import { emcKeys, surveyEmcPath } from './emc-keys';

export function listEmcRooms(organisationId: string, surveyId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${surveyEmcPath(organisationId, surveyId)}/rooms`, EmcRoomListSchema, { signal });
}

export const emcRoomsQueryOptions = (organisationId: string, surveyId: string) =>
  queryOptions({
    queryKey: emcKeys.rooms(organisationId, surveyId),
    queryFn: ({ signal }) => listEmcRooms(organisationId, surveyId, { signal }),
    enabled: organisationId !== '' && surveyId !== '',
  });

export function useEmcRooms(organisationId: string, surveyId: string) {
  return useQuery(emcRoomsQueryOptions(organisationId, surveyId));
}
