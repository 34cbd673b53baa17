import { useMutation, useQueryClient } from '@tanstack/react-query';
import { WatchBandImportResultSchema, type WatchBandImport } from '@shared/schemas/watch-band';
import { api } from '@/lib/api';
import { emcKeys, watchBandsPath } from './emc-keys';

export function importWatchBands(organisationId: string, body: WatchBandImport) {
  return api.post(`${watchBandsPath(organisationId)}/import`, body, WatchBandImportResultSchema);
}

export function useImportWatchBands(organisationId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: WatchBandImport) => importWatchBands(organisationId, body),
    onSuccess: (result) => {
      if (result.created + result.updated > 0) void queryClient.invalidateQueries({ queryKey: emcKeys.watchBands(organisationId) });
    },
  });
}
