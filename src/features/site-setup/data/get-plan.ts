import { queryOptions, useQuery } from '@tanstack/react-query';
import { PlanSchema } from '@shared/schemas/plan';
import { api } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export function getPlan(organisationId: string, planId: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`${orgPath(organisationId)}/plans/${encodeURIComponent(planId)}`, PlanSchema, { signal });
}

export const planQueryOptions = (organisationId: string, planId: string) =>
  queryOptions({
    queryKey: siteSetupKeys.plan(organisationId, planId),
    queryFn: ({ signal }) => getPlan(organisationId, planId, { signal }),
    enabled: organisationId !== '' && planId !== '',
  });

export function usePlan(organisationId: string, planId: string) {
  return useQuery(planQueryOptions(organisationId, planId));
}

/** URL of a plan's image; the device copy is the downscaled one (the original when small enough). */
export function planImageUrl(organisationId: string, planId: string, variant: 'device' | 'original' = 'device') {
  return `${orgPath(organisationId)}/plans/${encodeURIComponent(planId)}/image?variant=${variant}`;
}
