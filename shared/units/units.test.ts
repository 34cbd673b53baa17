import fc from 'fast-check';
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import { PhysicsInputError, type PhysicsInputErrorCode } from '../physics/errors';
import { fluxDensityTextSchema, powerTextSchema } from './schemas';
import {
  formatEnergy,
  formatFluxDensity,
  formatFrequency,
  formatLength,
  formatPower,
  formatQuantity,
  fromSi,
  parseEnergyJ,
  parseFluxDensityTesla,
  parseFrequencyHz,
  parseLengthM,
  parsePowerW,
  parseQuantity,
  toSi,
  unitsFor,
  type QuantityKind,
} from './units';

const codeOf = (fn: () => unknown): PhysicsInputErrorCode | undefined => {
  try {
    fn();
  } catch (error) {
    if (error instanceof PhysicsInputError) return error.code;
    throw error;
  }
  return undefined;
};

describe('parsing', () => {
  // 1 G = 1e-4 T exactly (SI brochure, 9th ed., non-SI CGS units); mathjs agrees.
  it.each([
    ['1 T', 1],
    ['0.5 mT', 0.5e-3],
    ['50 µT', 50e-6],
    ['50 uT', 50e-6],
    ['50 μT', 50e-6],
    ['25000 nT', 25e-6],
    ['5 G', 5e-4],
    ['5G', 5e-4],
    ['500 mG', 50e-6],
    ['1.5 kG', 0.15],
    ['+2e-3 T', 2e-3],
    ['  3 mT  ', 3e-3],
  ])('flux density “%s” is %s T', (text, tesla) => {
    expect(parseFluxDensityTesla(text)).toBeCloseTo(tesla, 15);
  });

  it('1 G = 1e-4 T exactly (SI Brochure, 9th ed., CGS units; recalled) — mathjs has no gauss, so no cross-check there', () => {
    expect(parseFluxDensityTesla('1 G')).toBe(1e-4);
    expect(parseFluxDensityTesla('1 mG')).toBe(1e-7);
    expect(parseFluxDensityTesla('1 kG')).toBe(0.1);
  });

  it('frequency, power and length prefixes agree with mathjs units (cross-check)', () => {
    for (const [text, unit, parse] of [
      ['2.45 GHz', 'Hz', parseFrequencyHz],
      ['13.56 MHz', 'Hz', parseFrequencyHz],
      ['2 mW', 'W', parsePowerW],
      ['120 cm', 'm', parseLengthM],
      ['5 mm', 'm', parseLengthM],
      ['1 J', 'J', parseEnergyJ],
    ] as const) {
      expect(parse(text)).toBeCloseTo(math.unit(text).toNumber(unit), 12);
    }
  });

  it('frequency, power, energy and length', () => {
    expect(parseFrequencyHz('2.45 GHz')).toBe(2.45e9);
    expect(parseFrequencyHz('13.56 MHz')).toBe(13.56e6);
    expect(parseFrequencyHz('1 kHz')).toBe(1e3);
    expect(parseFrequencyHz('60 Hz')).toBe(60);
    expect(parsePowerW('-30 dBm')).toBeCloseTo(1e-6, 18);
    expect(parsePowerW('0 dBW')).toBe(1);
    expect(parsePowerW('2 mW')).toBe(2e-3);
    expect(parsePowerW('−60 dBm')).toBeCloseTo(1e-9, 20); // Unicode minus from copy-paste
    expect(parseEnergyJ('1 eV')).toBe(1.602176634e-19); // exact since the 2019 SI
    expect(parseEnergyJ('10 keV')).toBeCloseTo(1.602176634e-15, 27);
    expect(parseEnergyJ('18 MeV')).toBeCloseTo(18 * 1.602176634e-13, 25);
    expect(parseLengthM('120 cm')).toBe(1.2);
    expect(parseLengthM('5 mm')).toBe(0.005);
    expect(parseQuantity('fluxDensity', '50 uT')).toMatchObject({ unit: 'µT', value: 50 });
  });

  it.each<[string, QuantityKind, string, PhysicsInputErrorCode]>([
    ['empty', 'fluxDensity', '', 'EMPTY_INPUT'],
    ['blank', 'fluxDensity', '   ', 'EMPTY_INPUT'],
    ['no unit', 'fluxDensity', '0.5', 'MISSING_UNIT'],
    ['unknown unit', 'fluxDensity', '0.5 Wb', 'UNKNOWN_UNIT'],
    ['megatesla is not guessed', 'fluxDensity', '0.5 MT', 'UNKNOWN_UNIT'],
    ['wrong quantity', 'frequency', '3 mT', 'UNKNOWN_UNIT'],
    ['lower-case mhz', 'frequency', '100 mhz', 'UNKNOWN_UNIT'],
    ['NaN', 'fluxDensity', 'NaN mT', 'NOT_A_NUMBER'],
    ['Infinity', 'fluxDensity', 'Infinity T', 'NOT_FINITE'],
    ['-Infinity dBm', 'power', '-Infinity dBm', 'NOT_FINITE'],
    ['∞', 'length', '∞ m', 'NOT_FINITE'],
    ['overflow', 'fluxDensity', '1e400 T', 'NOT_FINITE'],
    ['negative field', 'fluxDensity', '-3 mT', 'NEGATIVE_VALUE'],
    ['negative length', 'length', '-1 m', 'NEGATIVE_VALUE'],
    ['negative watts', 'power', '-1 W', 'NEGATIVE_VALUE'],
    ['decimal comma', 'frequency', '1,5 MHz', 'MALFORMED_NUMBER'],
    ['words', 'energy', 'ten keV', 'MALFORMED_NUMBER'],
    ['two numbers', 'length', '1 2 m', 'MALFORMED_NUMBER'],
    ['hex', 'frequency', '0x10 Hz', 'MALFORMED_NUMBER'],
  ])('%s raises %s… with the typed error', (_name, kind, text, code) => {
    expect(codeOf(() => parseQuantity(kind, text))).toBe(code);
  });

  it('error messages are sentences a form can show, with a hint for case mistakes and commas', () => {
    expect(() => parseFluxDensityTesla('0.5 MT')).toThrow(/did you mean “mT”/);
    expect(() => parseFrequencyHz('1,5 MHz')).toThrow(/decimal separator/);
    expect(() => parseFluxDensityTesla('')).toThrow(/required/);
  });

  it('negative decibels are fine; dB values beyond double range are not', () => {
    expect(parsePowerW('-170 dBm')).toBeCloseTo(1e-20, 30);
    expect(codeOf(() => parsePowerW('4000 dBW'))).toBe('NOT_FINITE');
    expect(codeOf(() => parsePowerW('-4000 dBW'))).toBe('NOT_FINITE');
  });
});

describe('formatting', () => {
  it('picks a unit that puts the number in [1, 1000)', () => {
    expect(formatFluxDensity(0.5e-3)).toBe('500.0 µT');
    expect(formatFluxDensity(3e-3)).toBe('3.000 mT');
    expect(formatFluxDensity(3)).toBe('3.000 T');
    expect(formatFluxDensity(0.5e-3, { system: 'gauss' })).toBe('5.000 G');
    expect(formatFluxDensity(0.5e-3, { unit: 'mT', significantDigits: 2 })).toBe('0.50 mT');
    expect(formatFrequency(2.45e9)).toBe('2.450 GHz');
    expect(formatPower(1e-6, { unit: 'dBm' })).toBe('-30.00 dBm');
    expect(formatEnergy(1.602176634e-15)).toBe('10.00 keV');
    expect(formatLength(0.012)).toBe('1.200 cm');
    expect(formatFluxDensity(0)).toBe('0 T');
  });

  it('refuses negative magnitudes and bad digit counts', () => {
    expect(codeOf(() => formatFluxDensity(-1))).toBe('NEGATIVE_VALUE');
    expect(codeOf(() => formatFluxDensity(NaN))).toBe('NOT_A_NUMBER');
    expect(codeOf(() => formatFluxDensity(Infinity))).toBe('NOT_FINITE');
    expect(codeOf(() => formatPower(0, { unit: 'dBm' }))).toBe('NOT_POSITIVE');
    expect(codeOf(() => formatFluxDensity(1, { significantDigits: 0 }))).toBe('OUT_OF_RANGE');
    expect(codeOf(() => formatFluxDensity(1, { unit: 'Wb' }))).toBe('UNKNOWN_UNIT');
  });
});

describe('round trips (fast-check)', () => {
  const kinds: QuantityKind[] = ['fluxDensity', 'frequency', 'power', 'energy', 'length'];
  it('parse(format(x)) returns x to the printed precision, for every unit', () => {
    fc.assert(
      fc.property(fc.constantFrom(...kinds), fc.double({ min: 1e-12, max: 1e12, noNaN: true }), fc.integer({ min: 3, max: 17 }), (kind, si, digits) => {
        return unitsFor(kind).every((unit) => {
          const text = formatQuantity(kind, si, { unit, significantDigits: digits });
          const back = parseQuantity(kind, text).valueSi;
          // printing rounds to half a unit in the last digit; conversions add a few ulps. A dB value printed
          // with d digits carries |value|·10^(1−d) dB of rounding, i.e. that × ln10/10 relative in watts.
          const printed = unit.startsWith('dB') ? Math.max(1, Math.abs(fromSi(kind, si, unit))) * 10 ** (1 - digits) * (Math.LN10 / 10) : 10 ** (1 - digits);
          return Math.abs(back / si - 1) <= printed + 1e-13;
        });
      }),
    );
  });

  it('toSi and fromSi invert each other for every unit', () => {
    fc.assert(
      fc.property(fc.constantFrom(...kinds), fc.double({ min: 1e-9, max: 1e9, noNaN: true }), fc.double({ min: -300, max: 300, noNaN: true }), (kind, value, db) =>
        unitsFor(kind).every((unit) =>
          unit.startsWith('dB')
            ? Math.abs(fromSi(kind, toSi(kind, db, unit), unit) - db) < 1e-10
            : Math.abs(fromSi(kind, toSi(kind, value, unit), unit) / value - 1) < 1e-12,
        ),
      ),
    );
  });
});

describe('zod schemas for forms', () => {
  it('turn text into SI and report the typed error’s message and code as the issue', () => {
    expect(fluxDensityTextSchema.parse('0.5 mT')).toBeCloseTo(0.5e-3, 15);
    expect(powerTextSchema.parse('-30 dBm')).toBeCloseTo(1e-6, 18);
    const result = fluxDensityTextSchema.safeParse('-3 mT');
    expect(result.success).toBe(false);
    const issue = result.error?.issues[0] as { message: string; params?: { code?: string } } | undefined;
    expect(issue?.message).toMatch(/cannot be negative/);
    expect(issue?.params?.code).toBe('NEGATIVE_VALUE');
  });
});
