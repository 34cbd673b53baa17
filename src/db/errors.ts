/**
 * Typed failures of the device store that the UI shows: a full disk is not a bug to hide in the
 * console, it is a message the surveyor must see before they log another reading.
 */
import type { z } from 'zod';

export type CaptureErrorCode = 'CAPTURE_INVALID' | 'STORAGE_FULL' | 'STORAGE_FAILED' | 'RECORD_NOT_FOUND' | 'RECORD_CONFLICT' | 'DOWNLOAD_FAILED';

export class CaptureError extends Error {
  override name = 'CaptureError';
  readonly code: CaptureErrorCode;
  constructor(code: CaptureErrorCode, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.code = code;
  }
}

/** Bad input: `issues` are zod's, with paths a form can place next to its fields. Nothing was written. */
export class CaptureValidationError extends CaptureError {
  override name = 'CaptureValidationError';
  readonly issues: z.core.$ZodIssue[];
  constructor(issues: z.core.$ZodIssue[]) {
    super('CAPTURE_INVALID', issues.map((issue) => (issue.path.length ? `${issue.path.join('.')}: ${issue.message}` : issue.message)).join('\n'));
    this.issues = issues;
  }
  /** First message per top-level field, for forms. */
  get fieldErrors(): Record<string, string> {
    const out: Record<string, string> = {};
    for (const issue of this.issues) {
      const key = issue.path.map(String).join('.') || '_';
      out[key] ??= issue.message;
    }
    return out;
  }
}

/** The browser refused the write for lack of space (QuotaExceededError). Nothing was written. */
export class StorageFullError extends CaptureError {
  override name = 'StorageFullError';
  constructor(cause?: unknown) {
    super('STORAGE_FULL', 'The device is out of storage space for Fringewalk. Nothing was saved. Free some space (or sync and remove old surveys) and save again.', { cause });
  }
}

function isQuotaError(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && depth < 5; depth++) {
    const name = (e as { name?: unknown }).name;
    if (name === 'QuotaExceededError' || name === 'QuotaExceeded') return true;
    e = (e as { inner?: unknown; cause?: unknown }).inner ?? (e as { cause?: unknown }).cause;
  }
  return false;
}

/** Map whatever Dexie/IndexedDB threw to a typed error; typed errors pass through unchanged. */
export function toCaptureError(error: unknown): CaptureError {
  if (error instanceof CaptureError) return error;
  if (isQuotaError(error)) return new StorageFullError(error);
  const message = error instanceof Error ? error.message : String(error);
  return new CaptureError('STORAGE_FAILED', `The device could not save this: ${message}`, { cause: error });
}

export function isCaptureError(error: unknown): error is CaptureError {
  return error instanceof CaptureError;
}
