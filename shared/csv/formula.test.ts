/**
 * Formula protection of CSV text cells. The characters that start a formula are OWASP's list ("CSV
 * Injection": =, +, -, @, tab, carriage return); the apostrophe prefix is the remedy it gives.
 */
import { describe, expect, it } from 'vitest';
import { protectCell, unprotectCell } from './formula';

describe('CSV formula protection', () => {
  it('prefixes a text a spreadsheet would run as a formula', () => {
    for (const text of ['=1+1', '+44 20', '-probe low', '@SUM(A1)', '\tindented', '\rreturn', '=HYPERLINK("http://x","y")']) {
      expect(protectCell(text)).toBe(`'${text}`);
    }
  });

  it('leaves other texts alone', () => {
    for (const text of ['', 'plain note', 'Room 1 = lab', "it's", "'quoted", ' =leading space', '0.5 mT']) expect(protectCell(text)).toBe(text);
  });

  it('reads back exactly what was written, apostrophes included', () => {
    for (const text of ['=1+1', "'=1+1", "''-x", "'", "'plain", '-', 'note', '', '@', "'\t"]) {
      expect(unprotectCell(protectCell(text))).toBe(text);
    }
  });
});
