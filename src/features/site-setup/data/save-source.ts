import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { SourceSchema, type SourceCreateSchema, type SourceUpdateSchema } from '@shared/schemas/source';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type SourceCreateInput = z.input<typeof SourceCreateSchema>;
export type SourceUpdateInput = z.input<typeof SourceUpdateSchema>;

export function createSource(organisationId: string, siteId: string, body: SourceCreateInput) {
  return apiRequest(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}/sources`, { method: 'POST', body, schema: SourceSchema });
}

export function updateSource(organisationId: string, sourceId: string, body: SourceUpdateInput) {
  return apiRequest(`${orgPath(organisationId)}/sources/${encodeURIComponent(sourceId)}`, { method: 'PATCH', body, schema: SourceSchema });
}

/** Create when no id is given, else edit: one hook for the one form. */
export function useSaveSource(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ sourceId, body }: { sourceId?: string; body: SourceCreateInput }) =>
      sourceId ? updateSource(organisationId, sourceId, body) : createSource(organisationId, siteId, body),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: siteSetupKeys.sources(organisationId, siteId) }),
        queryClient.invalidateQueries({ queryKey: siteSetupKeys.sites(organisationId) }),
      ]),
  });
}
