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

export { checkedBy, emptyToNull, toNumberOrNull } from '@/lib/form-errors';
