import { z } from 'zod';
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import type { Role } from '@shared/schemas/common';
import { applyRequestError } from '@/lib/form-errors';
import { showToast } from '@/lib/toast';

export const SETUP_NEEDS_NETWORK = 'Saving needs a network connection. Nothing was changed; try again when you are back online.';

/** Field problems go next to their fields; whatever is left is shown as a toast. */
export function reportFormError<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fields: ReadonlyArray<Path<T>>) {
  const rest = applyRequestError(error, setError, fields, { offlineMessage: SETUP_NEEDS_NETWORK });
  if (rest) showToast({ tone: 'danger', message: rest });
}

/** Site setup is written by admins and reviewers (the API's rule); everyone else reads. */
export function canEditSites(role: Role | undefined): boolean {
  return role === 'admin' || role === 'reviewer';
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
