import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { InstrumentSchema, type InstrumentCreateSchema, type InstrumentUpdateSchema } from '@shared/schemas/instrument';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type InstrumentCreateInput = z.input<typeof InstrumentCreateSchema>;
export type InstrumentUpdateInput = z.input<typeof InstrumentUpdateSchema>;

export function createInstrument(organisationId: string, body: InstrumentCreateInput) {
  return apiRequest(`${orgPath(organisationId)}/instruments`, { method: 'POST', body, schema: InstrumentSchema });
}

export function updateInstrument(organisationId: string, instrumentId: string, body: InstrumentUpdateInput) {
  return apiRequest(`${orgPath(organisationId)}/instruments/${encodeURIComponent(instrumentId)}`, { method: 'PATCH', body, schema: InstrumentSchema });
}

export function useSaveInstrument(organisationId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ instrumentId, body }: { instrumentId?: string; body: InstrumentCreateInput }) =>
      instrumentId ? updateInstrument(organisationId, instrumentId, body) : createInstrument(organisationId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: siteSetupKeys.instruments(organisationId) }),
  });
}
