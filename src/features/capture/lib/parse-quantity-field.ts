/**
 * Turning what a surveyor typed into one box (a number, with the unit from the picker beside it, or a
 * number with its own unit) into an SI value, with a message that says exactly what is wrong.
 * The parsing itself is shared/units (strict: no guessing of case, no decimal commas).
 */
import { isPhysicsInputError, parseQuantity, type QuantityKind } from '@shared/units';

export type ParseResult = { ok: true; value: number } | { ok: false; message: string };

const BARE_NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

function normalise(text: string): string {
  return text.trim().replace(/\u2212/g, '-');
}

/**
 * Parses `text` as a quantity; a bare number takes `unit`. `signed` allows a leading minus (field
 * components along a probe axis), which shared/units refuses for magnitudes.
 */
export function parseQuantityField(kind: QuantityKind, label: string, text: string, unit: string, options: { signed?: boolean } = {}): ParseResult {
  const raw = normalise(text);
  if (raw === '') return { ok: false, message: `Enter ${label}.` };
  let sign = 1;
  let body = raw;
  if (options.signed && body.startsWith('-')) {
    sign = -1;
    body = body.slice(1).trim();
  }
  if (/^\d+,\d+/.test(body)) return { ok: false, message: `${label}: use a point for decimals (${body.replace(',', '.')}), not a comma.` };
  const withUnit = BARE_NUMBER.test(body) ? `${body} ${unit}` : body;
  try {
    const parsed = parseQuantity(kind, withUnit);
    return { ok: true, value: sign * parsed.valueSi === 0 ? 0 : sign * parsed.valueSi };
  } catch (error) {
    if (!isPhysicsInputError(error)) throw error;
    switch (error.code) {
      case 'NEGATIVE_VALUE':
        return { ok: false, message: `${label} cannot be negative.` };
      case 'UNKNOWN_UNIT':
        return { ok: false, message: `${label}: ${error.message}` };
      case 'NOT_FINITE':
        return { ok: false, message: `${label} is too large to be a number.` };
      case 'MISSING_UNIT':
      case 'MALFORMED_NUMBER':
      case 'NOT_A_NUMBER':
      default:
        return { ok: false, message: `${label}: “${raw}” is not a number. Type digits, e.g. 0.52 or 1.2e-3.` };
    }
  }
}

/** A plain signed number (dBm levels): "-30", "−30", "-30 dBm". */
export function parseDbmField(label: string, text: string): ParseResult {
  const raw = normalise(text).replace(/\s*dBm$/i, '');
  if (raw === '') return { ok: false, message: `Enter ${label} in dBm.` };
  if (/^[+-]?\d+,\d+$/.test(raw)) return { ok: false, message: `${label}: use a point for decimals, not a comma.` };
  if (!BARE_NUMBER.test(raw)) return { ok: false, message: `${label}: “${text.trim()}” is not a number of dBm, e.g. -30.` };
  const value = Number(raw);
  if (!Number.isFinite(value)) return { ok: false, message: `${label} is too large to be a number.` };
  return { ok: true, value };
}
