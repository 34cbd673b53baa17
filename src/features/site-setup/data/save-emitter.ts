import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { EmitterSchema, type EmitterCreateSchema } from '@shared/schemas/emitter';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type EmitterCreateInput = z.input<typeof EmitterCreateSchema>;

export function createEmitter(organisationId: string, siteId: string, body: EmitterCreateInput) {
  return apiRequest(`${orgPath(organisationId)}/sites/${encodeURIComponent(siteId)}/emitters`, { method: 'POST', body, schema: EmitterSchema });
}

export function updateEmitter(organisationId: string, emitterId: string, body: Partial<EmitterCreateInput>) {
  return apiRequest(`${orgPath(organisationId)}/emitters/${encodeURIComponent(emitterId)}`, { method: 'PATCH', body, schema: EmitterSchema });
}

export function useSaveEmitter(organisationId: string, siteId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ emitterId, body }: { emitterId?: string; body: EmitterCreateInput }) =>
      emitterId ? updateEmitter(organisationId, emitterId, body) : createEmitter(organisationId, siteId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: siteSetupKeys.emitters(organisationId, siteId) }),
  });
}
