import { useMutation, useQueryClient } from '@tanstack/react-query';
import { InstrumentSchema } from '@shared/schemas/instrument';
import { orgPath, siteSetupKeys } from './site-setup-keys';
import { uploadWithProgress, type UploadProgress } from './upload-with-progress';

export function uploadAntennaFactors(organisationId: string, instrumentId: string, file: File, onProgress?: (progress: UploadProgress) => void) {
  return uploadWithProgress(`${orgPath(organisationId)}/instruments/${encodeURIComponent(instrumentId)}/antenna-factors`, file, {
    method: 'PUT',
    schema: InstrumentSchema,
    onProgress,
  });
}

export function useUploadAntennaFactors(organisationId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ instrumentId, file, onProgress }: { instrumentId: string; file: File; onProgress?: (progress: UploadProgress) => void }) =>
      uploadAntennaFactors(organisationId, instrumentId, file, onProgress),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: siteSetupKeys.instruments(organisationId) }),
  });
}
