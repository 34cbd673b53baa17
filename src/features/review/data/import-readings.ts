import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ApiErrorSchema } from '@shared/schemas/common';
import { ImportReportSchema, type ImportReport } from '@shared/schemas/review';
import { ApiRequestError, CLIENT_ERROR_CODES, errorFromResponse } from '@/lib/api';
import { reviewKeys, surveyPath } from './review-keys';

export type ImportMode = ImportReport['mode'];

/**
 * Sends a CSV file as text/csv. `check` answers with the per-row report only; `all` imports only a
 * file with no bad rows (otherwise the report comes back inside the 400); `valid` imports the good rows.
 */
export async function importReadings(organisationId: string, surveyId: string, csv: string, mode: ImportMode): Promise<ImportReport> {
  let response: Response;
  try {
    response = await fetch(`${surveyPath(organisationId, surveyId)}/imports/readings?mode=${mode}`, {
      method: 'POST',
      credentials: 'same-origin',
      headers: { Accept: 'application/json', 'Content-Type': 'text/csv' },
      body: csv,
    });
  } catch {
    throw new ApiRequestError({ status: 0, code: CLIENT_ERROR_CODES.network, message: 'Cannot reach the server. Check the network connection.' });
  }
  if (response.status === 400) {
    const body: unknown = await response.clone().json().catch(() => null);
    const parsed = ApiErrorSchema.safeParse(body);
    const report = parsed.success ? ImportReportSchema.safeParse((parsed.data.error.details as { report?: unknown } | undefined)?.report) : null;
    if (report?.success) return report.data;
  }
  if (!response.ok) throw await errorFromResponse(response);
  return ImportReportSchema.parse(await response.json());
}

export function useImportReadings(organisationId: string, surveyId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ csv, mode }: { csv: string; mode: ImportMode }) => importReadings(organisationId, surveyId, csv, mode),
    onSuccess: (report) => {
      if (report.committed) void client.invalidateQueries({ queryKey: reviewKeys.survey(organisationId, surveyId) });
    },
  });
}
