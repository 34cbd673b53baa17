import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { SiteDetailSchema, type SiteCreateSchema } from '@shared/schemas/site';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type SiteCreateInput = z.input<typeof SiteCreateSchema>;

export function createSite(organisationId: string, body: SiteCreateInput) {
  return apiRequest(`${orgPath(organisationId)}/sites`, { method: 'POST', body, schema: SiteDetailSchema });
}

export function useCreateSite(organisationId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SiteCreateInput) => createSite(organisationId, body),
    onSuccess: (site) => {
      queryClient.setQueryData(siteSetupKeys.site(organisationId, site.id), site);
      return queryClient.invalidateQueries({ queryKey: siteSetupKeys.sites(organisationId) });
    },
  });
}
