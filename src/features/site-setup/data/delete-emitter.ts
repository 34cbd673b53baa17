import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function deleteEmitter(organisationId: string, emitterId: string) {
  return apiRequest(`${orgPath(organisationId)}/emitters/${encodeURIComponent(emitterId)}`, { method: 'DELETE' });
}

export function useDeleteEmitter(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (emitterId: string) => deleteEmitter(organisationId, emitterId),
    meta: { toastErrors: true },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: siteSetupKeys.emitters(organisationId, siteId) }),
  });
}
