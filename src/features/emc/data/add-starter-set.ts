import { useMutation, useQueryClient } from '@tanstack/react-query';
import { StarterSetResultSchema } from '@shared/schemas/watch-band';
import { api } from '@/lib/api';
import { emcKeys, watchBandsPath } from './emc-keys';

export function addStarterSet(organisationId: string) {
  return api.post(`${watchBandsPath(organisationId)}/starter-set`, {}, StarterSetResultSchema);
}

export function useAddStarterSet(organisationId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => addStarterSet(organisationId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: emcKeys.watchBands(organisationId) }),
  });
}
