import fc from 'fast-check';
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import { formatScaled, parseScaled, shiftDecimal } from './decimal-shift';

describe('shiftDecimal', () => {
  it('moves the decimal point of plain and exponent text', () => {
    expect(shiftDecimal('0.0123', 3)).toBe('12.3');
    expect(shiftDecimal('12.3', -3)).toBe('0.0123');
    expect(shiftDecimal('1.5e-7', 3)).toBe('0.00015');
    expect(shiftDecimal('-2', 3)).toBe('-2000');
    expect(shiftDecimal('0', 3)).toBe('0');
    expect(shiftDecimal('-0.000', 3)).toBe('0');
    expect(shiftDecimal('.5', 0)).toBe('0.5');
    expect(shiftDecimal('abc', 3)).toBeNull();
    expect(shiftDecimal('', 3)).toBeNull();
    expect(shiftDecimal('1,5', 3)).toBeNull();
  });

  it('agrees with mathjs BigNumber decimal arithmetic (reference library)', () => {
    fc.assert(
      fc.property(fc.double({ min: -100, max: 100, noNaN: true, noDefaultInfinity: true }), fc.integer({ min: -6, max: 6 }), (value, places) => {
        const ours = formatScaled(value, places);
        const reference = math.bignumber(String(value)).times(math.bignumber(10).pow(places));
        expect(math.bignumber(ours).equals(reference)).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });

  it('reads back exactly the double it wrote (tesla → mT text → tesla)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 50, noNaN: true }), (tesla) => {
        expect(Object.is(parseScaled(formatScaled(tesla, 3), -3), tesla === 0 ? 0 : tesla)).toBe(true);
      }),
      { numRuns: 5000 },
    );
  });
});
