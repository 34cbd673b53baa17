import { queryOptions, useQuery } from '@tanstack/react-query';
import { InstrumentListSchema } from '@shared/schemas/instrument';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function listInstruments(organisationId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/instruments`, InstrumentListSchema, { signal });
}

export const instrumentsQueryOptions = (organisationId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.instruments(organisationId),
    queryFn: ({ signal }) => listInstruments(organisationId, { signal }),
    enabled: organisationId !== '',
  });

export function useInstruments(organisationId: string) {
  return useQuery(instrumentsQueryOptions(organisationId));
}
