import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { LevelSchema, type LevelCreateSchema } from '@shared/schemas/site';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type LevelCreateInput = z.input<typeof LevelCreateSchema>;

export function createLevel(organisationId: string, siteId: string, body: LevelCreateInput) {
  return apiRequest(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}/levels`, { method: 'POST', body, schema: LevelSchema });
}

export function useCreateLevel(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: LevelCreateInput) => createLevel(organisationId, siteId, body),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: siteSetupKeys.site(organisationId, siteId) }),
        queryClient.invalidateQueries({ queryKey: siteSetupKeys.sites(organisationId) }),
      ]),
  });
}
