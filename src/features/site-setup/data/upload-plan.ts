import { useMutation, useQueryClient } from '@tanstack/react-query';
import { PlanSchema } from '@shared/schemas/plan';
import { orgPath, siteSetupKeys } from './site-setup-keys';
import { uploadWithProgress, type UploadProgress } from './upload-with-progress';

export function uploadPlan(organisationId: string, levelId: string, file: File, onProgress?: (progress: UploadProgress) => void) {
  return uploadWithProgress(`${orgPath(organisationId)}/levels/${encodeURIComponent(levelId)}/plans`, file, { schema: PlanSchema, onProgress });
}

export function useUploadPlan(organisationId: string, siteId: string, levelId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ file, onProgress }: { file: File; onProgress?: (progress: UploadProgress) => void }) =>
      uploadPlan(organisationId, levelId, file, onProgress),
    onSuccess: (plan) => {
      queryClient.setQueryData(siteSetupKeys.plan(organisationId, plan.id), plan);
      return queryClient.invalidateQueries({ queryKey: siteSetupKeys.site(organisationId, siteId) });
    },
  });
}
