import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function deleteSource(organisationId: string, sourceId: string) {
  return apiRequest(`${orgPath(organisationId)}/sources/${encodeURIComponent(sourceId)}`, { method: 'DELETE' });
}

export function useDeleteSource(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (sourceId: string) => deleteSource(organisationId, sourceId),
    meta: { toastErrors: true },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: siteSetupKeys.sources(organisationId, siteId) }),
  });
}
