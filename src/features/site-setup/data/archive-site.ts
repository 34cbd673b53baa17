import { useMutation, useQueryClient } from '@tanstack/react-query';
import { SiteDetailSchema } from '@shared/schemas/site';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

/** Archive (archived = true) or bring back a site; sites with surveys are never deleted. */
export function archiveSite(organisationId: string, siteId: string, archived: boolean) {
  return apiRequest(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}/${archived ? 'archive' : 'unarchive'}`, {
    method: 'POST',
    body: {},
    schema: SiteDetailSchema,
  });
}

export function useArchiveSite(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (archived: boolean) => archiveSite(organisationId, siteId, archived),
    meta: { toastErrors: true },
    onSuccess: (site) => {
      queryClient.setQueryData(siteSetupKeys.site(organisationId, siteId), site);
      return queryClient.invalidateQueries({ queryKey: siteSetupKeys.sites(organisationId) });
    },
  });
}
