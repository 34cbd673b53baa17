/**
 * Strict parsing and formatting of the quantities a surveyor types: magnetic flux density, frequency,
 * power, energy and length. Internal values are SI (T, Hz, W, J, m).
 *
 * Accepted units (case-sensitive — "MT" would be megatesla, so "mT" is not guessed):
 *   flux density  T, mT, µT (also uT and Greek μT), nT, G, mG, kG        1 G = 1e-4 T (exact)
 *   frequency     Hz, kHz, MHz, GHz
 *   power         W, mW, dBm, dBW                                       P[W] = 10^((dBm − 30)/10)
 *   energy        eV, keV, MeV, J                                       1 eV = 1.602 176 634e-19 J (exact, SI 2019)
 *   length        m, cm, mm
 *
 * Text is "<number><optional space><unit>", the number in plain or exponent notation with a point as
 * decimal separator. Empty text, a missing or unknown unit, NaN, ±Infinity, a decimal comma, or a
 * negative magnitude of a linear quantity raise {@link PhysicsInputError}; nothing returns NaN.
 * Decibel powers (dBm, dBW) may be negative.
 */

import { ELECTRON_VOLT_J } from '../physics/constants';
import { PhysicsInputError, requireFinite, requireInteger, requireNonNegative, requirePositive } from '../physics/errors';

/** The quantities handled here. */
export type QuantityKind = 'fluxDensity' | 'frequency' | 'power' | 'energy' | 'length';

/** SI unit of each quantity. */
export const SI_UNIT: Readonly<Record<QuantityKind, string>> = Object.freeze({
  fluxDensity: 'T',
  frequency: 'Hz',
  power: 'W',
  energy: 'J',
  length: 'm',
});

/** A linear unit: SI = value × multiply / divide (one of them is 1; dividing keeps 1e-3 etc. exact). */
interface LinearUnit {
  readonly kind: 'linear';
  readonly symbol: string;
  readonly multiply: number;
  readonly divide: number;
}

/** A logarithmic power unit: W = 10^((value − offsetDb)/10). */
interface DecibelUnit {
  readonly kind: 'decibel';
  readonly symbol: string;
  /** dB value of 1 W: 30 for dBm, 0 for dBW. */
  readonly offsetDb: number;
}

type UnitDef = LinearUnit | DecibelUnit;

const lin = (symbol: string, multiply: number, divide = 1): LinearUnit => ({ kind: 'linear', symbol, multiply, divide });

/** Units per quantity, in the order offered to a user. Display symbols use the micro sign µ (U+00B5). */
const UNITS: Readonly<Record<QuantityKind, readonly UnitDef[]>> = Object.freeze({
  fluxDensity: [lin('T', 1), lin('mT', 1, 1e3), lin('µT', 1, 1e6), lin('nT', 1, 1e9), lin('kG', 1, 10), lin('G', 1, 1e4), lin('mG', 1, 1e7)],
  frequency: [lin('Hz', 1), lin('kHz', 1e3), lin('MHz', 1e6), lin('GHz', 1e9)],
  power: [lin('W', 1), lin('mW', 1, 1e3), { kind: 'decibel', symbol: 'dBm', offsetDb: 30 }, { kind: 'decibel', symbol: 'dBW', offsetDb: 0 }],
  energy: [lin('eV', ELECTRON_VOLT_J), lin('keV', 1e3 * ELECTRON_VOLT_J), lin('MeV', 1e6 * ELECTRON_VOLT_J), lin('J', 1)],
  length: [lin('m', 1), lin('cm', 1, 100), lin('mm', 1, 1e3)],
});

/** Spellings accepted besides the display symbol. */
const ALIASES: Readonly<Record<string, string>> = Object.freeze({
  uT: 'µT',
  'μT': 'µT', // Greek small letter mu (U+03BC)
});

const NAMES: Readonly<Record<QuantityKind, string>> = Object.freeze({
  fluxDensity: 'Magnetic flux density',
  frequency: 'Frequency',
  power: 'Power',
  energy: 'Energy',
  length: 'Length',
});

/** Unit symbols accepted for a quantity (display spellings; µ also as u or Greek μ). */
export function unitsFor(kind: QuantityKind): string[] {
  return requireKind(kind).map((u) => u.symbol);
}

function requireKind(kind: QuantityKind): readonly UnitDef[] {
  const units = Object.prototype.hasOwnProperty.call(UNITS, kind) ? UNITS[kind] : undefined;
  if (!units) {
    throw new PhysicsInputError('INVALID_INPUT', `Unknown quantity "${String(kind)}".`, { field: 'kind', value: kind });
  }
  return units;
}

function findUnit(kind: QuantityKind, symbol: string): UnitDef {
  const units = requireKind(kind);
  const canonical = ALIASES[symbol] ?? symbol;
  const found = units.find((u) => u.symbol === canonical);
  if (found) return found;
  const folded = units.filter((u) => u.symbol.toLowerCase() === canonical.toLowerCase());
  const hint = folded.length === 1 ? ` Units are case-sensitive: did you mean “${(folded[0] as UnitDef).symbol}”?` : '';
  throw new PhysicsInputError(
    'UNKNOWN_UNIT',
    `“${symbol}” is not a unit of ${NAMES[kind].toLowerCase()}. Use one of: ${units.map((u) => u.symbol).join(', ')}.${hint}`,
    { field: 'unit', value: symbol },
  );
}

/** Converts a value in `unit` to SI. Linear units reject negative values; dB units accept any finite value. */
export function toSi(kind: QuantityKind, value: number, unit: string): number {
  const def = findUnit(kind, unit);
  if (def.kind === 'decibel') {
    requireFinite(value, 'value');
    const watts = 10 ** ((value - def.offsetDb) / 10);
    // 10^(x/10) overflows to Infinity above ~3080 dB and underflows to 0 below ~−3240 dB.
    if (!(watts > 0) || !Number.isFinite(watts)) {
      throw new PhysicsInputError('NOT_FINITE', `${value} ${def.symbol} is outside the representable range.`, { field: 'value', value });
    }
    return watts;
  }
  requireNonNegative(value, 'value');
  const si = def.divide === 1 ? value * def.multiply : value / def.divide;
  if (!Number.isFinite(si)) {
    throw new PhysicsInputError('NOT_FINITE', `${value} ${def.symbol} is too large.`, { field: 'value', value });
  }
  return si === 0 ? 0 : si;
}

/** Converts an SI value to `unit`. For dB units the SI power must be > 0. */
export function fromSi(kind: QuantityKind, siValue: number, unit: string): number {
  const def = findUnit(kind, unit);
  if (def.kind === 'decibel') {
    requirePositive(siValue, 'siValue');
    return 10 * Math.log10(siValue) + def.offsetDb;
  }
  requireNonNegative(siValue, 'siValue');
  return def.divide === 1 ? siValue / def.multiply : siValue * def.divide;
}

/** A parsed quantity. */
export interface ParsedQuantity {
  readonly kind: QuantityKind;
  /** Value in the SI unit of the quantity. */
  readonly valueSi: number;
  /** The number as typed. */
  readonly value: number;
  /** The unit's display symbol (aliases normalised, e.g. "uT" → "µT"). */
  readonly unit: string;
}

// The unit must start with a letter or µ/μ, so "0.5" cannot split into the number "0." and a unit "5".
const NUMBER_AND_UNIT = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*([^\d\s.,+-]\S*)$/u;
const MAX_TEXT_LENGTH = 64;

/**
 * Parses "<number> <unit>" for a quantity into SI (see module docblock for the accepted units).
 * Errors: EMPTY_INPUT, MISSING_UNIT, UNKNOWN_UNIT, MALFORMED_NUMBER, NOT_A_NUMBER, NOT_FINITE, NEGATIVE_VALUE.
 */
export function parseQuantity(kind: QuantityKind, text: string): ParsedQuantity {
  requireKind(kind);
  const name = NAMES[kind];
  if (typeof text !== 'string' || text.trim() === '') {
    throw new PhysicsInputError('EMPTY_INPUT', `${name} is required: enter a value with its unit, e.g. ${example(kind)}.`, {
      field: kind,
      value: text,
    });
  }
  // Normalise the Unicode minus sign (U+2212) that copy-paste often brings.
  const normalised = text.trim().replace(/\u2212/g, '-');
  if (normalised.length > MAX_TEXT_LENGTH) {
    throw new PhysicsInputError('MALFORMED_NUMBER', `${name} is too long to be a value with a unit.`, { field: kind, value: text });
  }
  if (/^[+-]?\s*(nan)\b/iu.test(normalised)) {
    throw new PhysicsInputError('NOT_A_NUMBER', `${name} is not a number.`, { field: kind, value: text });
  }
  if (/^[+-]?\s*(inf(inity)?\b|∞)/iu.test(normalised)) {
    throw new PhysicsInputError('NOT_FINITE', `${name} must be a finite number.`, { field: kind, value: text });
  }
  const match = NUMBER_AND_UNIT.exec(normalised);
  if (!match) {
    if (/^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/u.test(normalised)) {
      throw new PhysicsInputError('MISSING_UNIT', `${name} needs a unit, e.g. ${example(kind)}.`, { field: kind, value: text });
    }
    const comma = /^[+-]?\d+,\d+/u.test(normalised) ? ' Use a point as the decimal separator.' : '';
    throw new PhysicsInputError('MALFORMED_NUMBER', `“${text.trim()}” is not a number with a unit, e.g. ${example(kind)}.${comma}`, {
      field: kind,
      value: text,
    });
  }
  const value = Number(match[1]);
  const unitText = match[2] as string;
  const def = findUnit(kind, unitText);
  if (!Number.isFinite(value)) {
    throw new PhysicsInputError('NOT_FINITE', `${name} is too large to represent.`, { field: kind, value: text });
  }
  if (def.kind === 'linear' && value < 0) {
    throw new PhysicsInputError('NEGATIVE_VALUE', `${name} cannot be negative.`, { field: kind, value: text });
  }
  const valueSi = toSi(kind, value === 0 ? 0 : value, def.symbol);
  return { kind, valueSi, value: value === 0 ? 0 : value, unit: def.symbol };
}

function example(kind: QuantityKind): string {
  switch (kind) {
    case 'fluxDensity':
      return '“0.5 mT”';
    case 'frequency':
      return '“2.45 GHz”';
    case 'power':
      return '“-30 dBm”';
    case 'energy':
      return '“10 keV”';
    case 'length':
      return '“1.2 m”';
  }
}

/** Parses a magnetic flux density ("0.5 mT", "5 G", "50 uT") to tesla. */
export function parseFluxDensityTesla(text: string): number {
  return parseQuantity('fluxDensity', text).valueSi;
}

/** Parses a frequency ("2.45 GHz") to hertz. */
export function parseFrequencyHz(text: string): number {
  return parseQuantity('frequency', text).valueSi;
}

/** Parses a power ("-30 dBm", "2 mW") to watts. */
export function parsePowerW(text: string): number {
  return parseQuantity('power', text).valueSi;
}

/** Parses an energy ("10 keV", "1.6e-19 J") to joules. */
export function parseEnergyJ(text: string): number {
  return parseQuantity('energy', text).valueSi;
}

/** Parses a length ("120 cm") to metres. */
export function parseLengthM(text: string): number {
  return parseQuantity('length', text).valueSi;
}

/** Options of {@link formatQuantity}. */
export interface FormatOptions {
  /** A unit symbol, or 'auto' (default) to pick one that puts the number in [1, 1000). */
  readonly unit?: string;
  /** Significant digits, 1..17 (default 4). */
  readonly significantDigits?: number;
  /** For flux density in 'auto' mode: SI (T, mT, µT, nT; default) or gauss (kG, G, mG). */
  readonly system?: 'SI' | 'gauss';
}

const AUTO_UNITS: Readonly<Record<QuantityKind, readonly string[]>> = Object.freeze({
  fluxDensity: ['T', 'mT', 'µT', 'nT'],
  frequency: ['GHz', 'MHz', 'kHz', 'Hz'],
  power: ['W', 'mW'],
  energy: ['MeV', 'keV', 'eV'],
  length: ['m', 'cm', 'mm'],
});

/**
 * Formats an SI value as "<number> <unit>" with `significantDigits` (default 4); the output parses back
 * with {@link parseQuantity}. Linear quantities must be ≥ 0; dB output needs a positive power.
 */
export function formatQuantity(kind: QuantityKind, siValue: number, options: FormatOptions = {}): string {
  requireKind(kind);
  const digits = requireInteger(options.significantDigits ?? 4, 'significantDigits', 1, 17);
  let unit = options.unit ?? 'auto';
  if (unit === 'auto') {
    requireNonNegative(siValue, 'siValue');
    const candidates = kind === 'fluxDensity' && options.system === 'gauss' ? ['kG', 'G', 'mG'] : AUTO_UNITS[kind];
    const last = candidates[candidates.length - 1] as string;
    unit = siValue === 0 ? (candidates[0] as string) : (candidates.find((u) => fromSi(kind, siValue, u) >= 1) ?? last);
  }
  const value = fromSi(kind, siValue, unit);
  const def = findUnit(kind, unit);
  return `${formatNumber(value, digits)} ${def.symbol}`;
}

function formatNumber(value: number, digits: number): string {
  if (value === 0) return '0';
  const text = value.toPrecision(digits);
  // toPrecision writes "1.5e+21"; keep that (it parses back), but drop the redundant "+".
  return text.replace('e+', 'e');
}

/** Formats tesla ("0.5000 mT" with 4 digits). */
export function formatFluxDensity(fieldTesla: number, options: FormatOptions = {}): string {
  return formatQuantity('fluxDensity', fieldTesla, options);
}

/** Formats hertz ("2.450 GHz"). */
export function formatFrequency(frequencyHz: number, options: FormatOptions = {}): string {
  return formatQuantity('frequency', frequencyHz, options);
}

/** Formats watts ("1.000 mW", or in dBm with `{ unit: 'dBm' }`). */
export function formatPower(powerW: number, options: FormatOptions = {}): string {
  return formatQuantity('power', powerW, options);
}

/** Formats joules ("10.00 keV"). */
export function formatEnergy(energyJ: number, options: FormatOptions = {}): string {
  return formatQuantity('energy', energyJ, options);
}

/** Formats metres ("1.200 m"). */
export function formatLength(lengthM: number, options: FormatOptions = {}): string {
  return formatQuantity('length', lengthM, options);
}
