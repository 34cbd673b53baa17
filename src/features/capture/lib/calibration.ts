/**
 * Whether an instrument's calibration had fallen due on the day of a reading. The due date is a
 * calendar date (server/db/schema/instruments.ts); a reading ON the due date is still within it and a
 * reading the day after is overdue (common practice: "due on" is the last valid day).
 */

/** The local calendar date of an instant, YYYY-MM-DD. */
export function localDate(at: Date): string {
  const y = at.getFullYear();
  const m = String(at.getMonth() + 1).padStart(2, '0');
  const d = String(at.getDate()).padStart(2, '0');
  return `${y}-${m}-${d}`;
}

/** True when `calibrationDueOn` (YYYY-MM-DD) lies before the reading's local date. */
export function isCalibrationOverdue(calibrationDueOn: string | null, readingAt: Date): boolean {
  if (!calibrationDueOn) return false;
  return localDate(readingAt) > calibrationDueOn;
}
