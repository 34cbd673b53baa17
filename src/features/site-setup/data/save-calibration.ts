import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { CalibrationResultSchema, type CalibrationInputSchema } from '@shared/schemas/plan';
import { apiRequest } from '@/lib/api';
import { orgPath, siteSetupKeys } from './site-setup-keys';

export type CalibrationInput = z.input<typeof CalibrationInputSchema>;

export function saveCalibration(organisationId: string, planId: string, body: CalibrationInput) {
  return apiRequest(`${orgPath(organisationId)}/plans/${encodeURIComponent(planId)}/calibration`, {
    method: 'PUT',
    body,
    schema: CalibrationResultSchema,
  });
}

export function useSaveCalibration(organisationId: string, siteId: string, planId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CalibrationInput) => saveCalibration(organisationId, planId, body),
    onSuccess: (result) => {
      queryClient.setQueryData(siteSetupKeys.plan(organisationId, planId), result.plan);
      // Re-calibration moves rooms, sources and emitters in metres: refetch everything on the site.
      return queryClient.invalidateQueries({ queryKey: siteSetupKeys.site(organisationId, siteId) });
    },
  });
}
