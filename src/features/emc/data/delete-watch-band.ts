import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api';
import { emcKeys, watchBandsPath } from './emc-keys';

export function deleteWatchBand(organisationId: string, watchBandId: string) {
  return apiRequest(`${watchBandsPath(organisationId)}/${encodeURIComponent(watchBandId)}`, { method: 'DELETE' });
}

export function useDeleteWatchBand(organisationId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (watchBandId: string) => deleteWatchBand(organisationId, watchBandId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: emcKeys.org(organisationId) }),
  });
}
