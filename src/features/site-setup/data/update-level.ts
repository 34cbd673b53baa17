import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { LevelSchema, type LevelUpdateSchema } from '@shared/schemas/site';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type LevelUpdateInput = z.input<typeof LevelUpdateSchema>;

export function updateLevel(organisationId: string, levelId: string, body: LevelUpdateInput) {
  return apiRequest(`${orgPath(organisationId)}/levels/${encodeURIComponent(levelId)}`, { method: 'PATCH', body, schema: LevelSchema });
}

export function useUpdateLevel(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ levelId, body }: { levelId: string; body: LevelUpdateInput }) => updateLevel(organisationId, levelId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: siteSetupKeys.site(organisationId, siteId) }),
  });
}
