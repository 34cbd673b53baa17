import { queryOptions, useQuery } from '@tanstack/react-query';
import { WatchBandListSchema } from '@shared/schemas/watch-band';
import { api } from '@/lib/api';
import { emcKeys, watchBandsPath } from './emc-keys';

export function listWatchBands(organisationId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(watchBandsPath(organisationId), WatchBandListSchema, { signal });
}

export const watchBandsQueryOptions = (organisationId: string) =>
  queryOptions({
    queryKey: emcKeys.watchBands(organisationId),
    queryFn: ({ signal }) => listWatchBands(organisationId, { signal }),
    enabled: organisationId !== '',
  });

export function useWatchBands(organisationId: string) {
  return useQuery(watchBandsQueryOptions(organisationId));
}

/** Where the organisation's bands download as CSV (a plain link: the browser saves the file). */
export const watchBandsCsvUrl = (organisationId: string) => `${watchBandsPath(organisationId)}/export.csv`;
