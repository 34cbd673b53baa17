import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { SiteDetailSchema, type SiteUpdateSchema } from '@shared/schemas/site';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type SiteUpdateInput = z.input<typeof SiteUpdateSchema>;

export function updateSite(organisationId: string, siteId: string, body: SiteUpdateInput) {
  return apiRequest(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}`, { method: 'PATCH', body, schema: SiteDetailSchema });
}

export function useUpdateSite(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SiteUpdateInput) => updateSite(organisationId, siteId, body),
    onSuccess: (site) => {
      queryClient.setQueryData(siteSetupKeys.site(organisationId, siteId), site);
      return queryClient.invalidateQueries({ queryKey: siteSetupKeys.sites(organisationId) });
    },
  });
}
