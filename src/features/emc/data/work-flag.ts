import { useMutation, useQueryClient } from '@tanstack/react-query';
import { EmcFlagSchema } from '@shared/schemas/emc';
import { api } from '@/lib/api';
import { emcKeys } from './emc-keys';

const flagPath = (organisationId: string, flagId: string) => `/api/orgs/${encodeURIComponent(organisationId)}/flags/${encodeURIComponent(flagId)}`;

export function acknowledgeFlag(organisationId: string, flagId: string, note: string) {
  return api.post(`${flagPath(organisationId, flagId)}/acknowledge`, { note }, EmcFlagSchema);
}

export function resolveFlag(organisationId: string, flagId: string, resolution: string) {
  return api.post(`${flagPath(organisationId, flagId)}/resolve`, { resolution }, EmcFlagSchema);
}

/** Acknowledge (with a note) or resolve (with the action taken) one flag. */
export function useWorkFlag(organisationId: string, surveyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ flagId, step, text }: { flagId: string; step: 'acknowledge' | 'resolve'; text: string }) =>
      step === 'acknowledge' ? acknowledgeFlag(organisationId, flagId, text) : resolveFlag(organisationId, flagId, text),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: emcKeys.survey(organisationId, surveyId) }),
  });
}
