import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { WatchBandSchema, type WatchBandCreateSchema, type WatchBandUpdateSchema } from '@shared/schemas/watch-band';
import { apiRequest } from '@/lib/api';
import { emcKeys, watchBandsPath } from './emc-keys';

export type WatchBandCreateInput = z.input<typeof WatchBandCreateSchema>;
export type WatchBandUpdateInput = z.input<typeof WatchBandUpdateSchema>;

export function createWatchBand(organisationId: string, body: WatchBandCreateInput) {
  return apiRequest(watchBandsPath(organisationId), { method: 'POST', body, schema: WatchBandSchema });
}

export function updateWatchBand(organisationId: string, watchBandId: string, body: WatchBandUpdateInput) {
  return apiRequest(`${watchBandsPath(organisationId)}/${encodeURIComponent(watchBandId)}`, { method: 'PATCH', body, schema: WatchBandSchema });
}

export function useSaveWatchBand(organisationId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ watchBandId, body }: { watchBandId?: string; body: WatchBandCreateInput }) => {
      if (!watchBandId) return createWatchBand(organisationId, body);
      // A band's scope (organisation or site) is fixed once made.
      const { siteId: _scope, ...patch } = body;
      return updateWatchBand(organisationId, watchBandId, patch);
    },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: emcKeys.org(organisationId) }),
  });
}
