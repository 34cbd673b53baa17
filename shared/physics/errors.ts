/**
 * Fringewalk physics and units: the one typed error and the input guards every public function uses.
 *
 * Every public function in shared/physics and shared/units validates its inputs with these guards and
 * throws {@link PhysicsInputError}; none returns a silent NaN. The `code` is stable (SCREAMING_SNAKE) so
 * the server's error handler and the PWA's forms can map it; the `message` is written for a person
 * filling a form ("Field must be greater than zero (got -3)").
 */

/** Stable error codes of {@link PhysicsInputError}. */
export type PhysicsInputErrorCode =
  /** The text is empty or only whitespace. */
  | 'EMPTY_INPUT'
  /** The text has a number but no unit. */
  | 'MISSING_UNIT'
  /** The unit is not one of the units accepted for this quantity. */
  | 'UNKNOWN_UNIT'
  /** The number part of a text cannot be read (e.g. "1,5", "abc"). */
  | 'MALFORMED_NUMBER'
  /** A value is NaN. */
  | 'NOT_A_NUMBER'
  /** A value is +Infinity or -Infinity (or overflows to it). */
  | 'NOT_FINITE'
  /** A magnitude that cannot be negative is negative. */
  | 'NEGATIVE_VALUE'
  /** A value that must be strictly positive is zero or negative. */
  | 'NOT_POSITIVE'
  /** A value is finite but outside the range the formula or model is valid for. */
  | 'OUT_OF_RANGE'
  /** A value must be an integer (harmonic number, charge number). */
  | 'NOT_AN_INTEGER'
  /** A species id is not known, or a custom species is malformed. */
  | 'UNKNOWN_SPECIES'
  /** Arrays that must have the same length do not. */
  | 'LENGTH_MISMATCH'
  /** Too few (or degenerate) data for the computation, e.g. collinear stations. */
  | 'INSUFFICIENT_DATA'
  /** A structured input (zone set, band, grid spec) fails validation. */
  | 'INVALID_INPUT';

/** The single error type thrown by Fringewalk's physics and unit code for bad input. */
export class PhysicsInputError extends Error {
  override readonly name = 'PhysicsInputError';
  readonly code: PhysicsInputErrorCode;
  /** Which input was wrong (e.g. "fieldTesla"), for pointing a form at the right field. */
  readonly field: string | undefined;
  /** The offending value, as given (kept for logs; never shown raw to a user without escaping). */
  readonly value: unknown;

  constructor(code: PhysicsInputErrorCode, message: string, options: { field?: string; value?: unknown } = {}) {
    super(message);
    this.code = code;
    this.field = options.field;
    this.value = options.value;
  }
}

/** True when `error` is a {@link PhysicsInputError} (optionally with the given code). */
export function isPhysicsInputError(error: unknown, code?: PhysicsInputErrorCode): error is PhysicsInputError {
  return error instanceof PhysicsInputError && (code === undefined || error.code === code);
}

function describe(value: unknown): string {
  if (typeof value === 'number') return Number.isNaN(value) ? 'NaN' : String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  return typeof value;
}

/** Label used in messages: "kineticEnergyJ" → "kineticEnergyJ". Kept as the identifier so logs match code. */
function label(name: string): string {
  return name;
}

/** Throws unless `value` is a finite number. Returns it for chaining. */
export function requireFinite(value: number, name: string): number {
  if (typeof value !== 'number') {
    throw new PhysicsInputError('NOT_A_NUMBER', `${label(name)} must be a number (got ${describe(value)}).`, {
      field: name,
      value,
    });
  }
  if (Number.isNaN(value)) {
    throw new PhysicsInputError('NOT_A_NUMBER', `${label(name)} is not a number (got NaN).`, { field: name, value });
  }
  if (!Number.isFinite(value)) {
    throw new PhysicsInputError('NOT_FINITE', `${label(name)} must be finite (got ${value}).`, { field: name, value });
  }
  return value;
}

/** Throws unless `value` is finite and ≥ 0. */
export function requireNonNegative(value: number, name: string): number {
  requireFinite(value, name);
  if (value < 0) {
    throw new PhysicsInputError('NEGATIVE_VALUE', `${label(name)} cannot be negative (got ${value}).`, {
      field: name,
      value,
    });
  }
  return value;
}

/** Throws unless `value` is finite and > 0. */
export function requirePositive(value: number, name: string): number {
  requireFinite(value, name);
  if (!(value > 0)) {
    throw new PhysicsInputError('NOT_POSITIVE', `${label(name)} must be greater than zero (got ${value}).`, {
      field: name,
      value,
    });
  }
  return value;
}

/** Throws unless `value` is finite and within [min, max] (inclusive). */
export function requireInRange(value: number, name: string, min: number, max: number, unit = ''): number {
  requireFinite(value, name);
  if (value < min || value > max) {
    const u = unit ? ` ${unit}` : '';
    throw new PhysicsInputError(
      'OUT_OF_RANGE',
      `${label(name)} must be between ${min}${u} and ${max}${u} (got ${value}${u}).`,
      { field: name, value },
    );
  }
  return value;
}

/** Throws unless `value` is an integer within [min, max]. */
export function requireInteger(value: number, name: string, min: number, max: number): number {
  requireFinite(value, name);
  if (!Number.isInteger(value)) {
    throw new PhysicsInputError('NOT_AN_INTEGER', `${label(name)} must be a whole number (got ${value}).`, {
      field: name,
      value,
    });
  }
  return requireInRange(value, name, min, max);
}

/**
 * Validates every element of an array: finite and > 0 (mode 'positive') or ≥ 0 ('nonNegative') or just
 * finite ('finite'). Reports the first bad index in the message. A plain loop: cheap next to the work.
 */
export function requireArray(
  values: ArrayLike<number>,
  name: string,
  mode: 'positive' | 'nonNegative' | 'finite',
): void {
  for (let i = 0; i < values.length; i++) {
    const v = values[i] as number;
    // One combined test for the hot path; details only when it fails.
    const ok = mode === 'positive' ? v > 0 && v < Infinity : mode === 'nonNegative' ? v >= 0 && v < Infinity : Number.isFinite(v);
    if (!ok) {
      const item = `${name}[${i}]`;
      if (mode === 'positive') requirePositive(v, item);
      else if (mode === 'nonNegative') requireNonNegative(v, item);
      else requireFinite(v, item);
    }
  }
}

/** Throws LENGTH_MISMATCH unless all arrays have the given length. */
export function requireSameLength(length: number, arrays: Record<string, ArrayLike<number>>): void {
  for (const [name, array] of Object.entries(arrays)) {
    if (array.length !== length) {
      throw new PhysicsInputError(
        'LENGTH_MISMATCH',
        `${name} has ${array.length} values but ${length} were expected.`,
        { field: name, value: array.length },
      );
    }
  }
}
