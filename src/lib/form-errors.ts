import { z } from 'zod';
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { CLIENT_ERROR_CODES, fieldIssues, isApiRequestError } from './api';

/**
 * Put a failed request's field errors next to their fields; return what is left to show for the
 * whole form (or null when every problem belonged to a field).
 */
export function applyRequestError<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  fields: ReadonlyArray<Path<T>>,
  { offlineMessage }: { offlineMessage: string },
): string | null {
  if (!isApiRequestError(error)) return error instanceof Error ? error.message : 'Something went wrong.';
  if (error.code === CLIENT_ERROR_CODES.network || error.code === CLIENT_ERROR_CODES.timeout) return offlineMessage;
  const issues = fieldIssues(error);
  const unplaced = issues.filter((issue) => {
    const field = fields.find((name) => name === issue.field);
    if (field) setError(field, { type: 'server', message: issue.message });
    return !field;
  });
  if (issues.length > 0 && unplaced.length === 0) return null;
  return unplaced[0]?.message ?? error.message;
}

/** Empty strings from text inputs mean "not given". */
export const emptyToNull = (value: unknown) => (typeof value === 'string' && value.trim() === '' ? null : value);
export const toNumberOrNull = (value: unknown) => {
  if (typeof value === 'number') return value;
  if (typeof value !== 'string' || value.trim() === '') return null;
  return Number(value);
};

/**
 * A refinement step that runs a shared schema over a form's converted values, so the form checks
 * exactly what the server will (cross-field rules included), with the same messages and paths.
 */
export function checkedBy<S extends z.ZodType>(schema: S) {
  return (value: unknown, ctx: z.RefinementCtx): z.output<S> => {
    const result = schema.safeParse(value);
    if (result.success) return result.data;
    for (const issue of result.error.issues) ctx.addIssue({ code: 'custom', message: issue.message, path: issue.path });
    return z.NEVER;
  };
}
