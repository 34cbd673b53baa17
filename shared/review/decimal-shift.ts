/**
 * Moving a decimal point in the text of a number, so a value stored in tesla can be written in a CSV
 * in millitesla and read back to exactly the same double (issue 7 §6: an export → import round trip
 * loses nothing). Multiplying by 1000 and dividing again does not promise that in binary floating
 * point; shifting the digits of the shortest round-trip decimal (ECMAScript's Number-to-String) does,
 * because the text read back is the very digits String(value) wrote, scaled by a power of ten.
 */

const NUMBER_TEXT = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/;

/** The text of `text × 10^places`, as a plain decimal ("0.0123" shifted by 3 is "12.3"). Null if `text` is not a decimal number. */
export function shiftDecimal(text: string, places: number): string | null {
  const trimmed = text.trim();
  const match = NUMBER_TEXT.exec(trimmed);
  if (!match) return null;
  const [, sign = '', intPart = '', fracPart = '', expPart] = match;
  if (intPart === '' && fracPart === '') return null;
  const digits = `${intPart}${fracPart}`;
  // Position of the decimal point, counted in digits from the left of `digits`.
  const point = intPart.length + Number(expPart ?? 0) + places;
  let whole: string;
  let fraction: string;
  if (point <= 0) {
    whole = '0';
    fraction = '0'.repeat(-point) + digits;
  } else if (point >= digits.length) {
    whole = digits + '0'.repeat(point - digits.length);
    fraction = '';
  } else {
    whole = digits.slice(0, point);
    fraction = digits.slice(point);
  }
  whole = whole.replace(/^0+(?=\d)/, '');
  fraction = fraction.replace(/0+$/, '');
  const body = fraction ? `${whole}.${fraction}` : whole;
  const isZero = /^0(\.0*)?$/.test(body);
  return `${sign === '-' && !isZero ? '-' : ''}${body}`;
}

/** `value` (a double) written × 10^places without binary rounding: shiftDecimal(String(value), places). */
export function formatScaled(value: number, places: number): string {
  if (!Number.isFinite(value)) throw new RangeError(`Cannot write ${value} as a decimal.`);
  return shiftDecimal(String(value), places)!;
}

/** Reads decimal text × 10^places as a double (parseScaled("12.3", -3) is 0.0123). NaN if not a number. */
export function parseScaled(text: string, places: number): number {
  const shifted = shiftDecimal(text, places);
  return shifted === null ? Number.NaN : Number(shifted);
}
