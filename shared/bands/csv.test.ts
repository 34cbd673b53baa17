/**
 * Watch-band CSV: written per RFC 4180 (fields with commas, quotes or line breaks quoted, quotes doubled,
 * CRLF line ends — checked against hand-written text), read back without loss, and bad rows reported
 * with the line they start on. Band values are invented test data.
 */
import { describe, expect, it } from 'vitest';
import { parseWatchBandCsv, watchBandsToCsv, type WatchBandCsvRow } from './csv';
import { STARTER_WATCH_BANDS } from './starter-set';

const band = (over: Partial<WatchBandCsvRow> = {}): WatchBandCsvRow => ({
  name: 'Test band',
  lowerHz: 100e6,
  upperHz: 110e6,
  reason: 'Invented',
  source: 'Invented test data',
  severity: 'medium',
  thresholdDbWPerM2Hz: null,
  notes: null,
  ...over,
});

describe('watchBandsToCsv', () => {
  it('writes RFC 4180: header with units, CRLF, quoting only where needed, quotes doubled', () => {
    const csv = watchBandsToCsv([band({ name: 'Plain', reason: 'Has, a comma', source: 'Says "hello"', notes: 'two\nlines', thresholdDbWPerM2Hz: -239 })]);
    expect(csv).toBe(
      'name,lower_MHz,upper_MHz,reason,source,severity,threshold_dBW_per_m2_Hz,notes\r\n' + 'Plain,100,110,"Has, a comma","Says ""hello""",medium,-239,"two\nlines"\r\n',
    );
  });

  it('writes MHz without float noise', () => {
    const gps = STARTER_WATCH_BANDS.find((b) => b.key === 'gnss-l1')!;
    expect(watchBandsToCsv([band({ lowerHz: gps.lowerHz, upperHz: gps.upperHz })])).toContain(',1574.397,1576.443,');
  });
});

describe('watch band CSV and spreadsheet formulas', () => {
  it('writes texts a spreadsheet would run (OWASP "CSV Injection": = + - @) with a leading apostrophe, and reads them back as they were', () => {
    const tricky = band({ name: '=cmd|calc', reason: '+44 reserved', source: '@registry', notes: '-3 dB margin', thresholdDbWPerM2Hz: -239 });
    const csv = watchBandsToCsv([tricky]);
    expect(csv.split('\r\n')[1]).toBe("'=cmd|calc,100,110,'+44 reserved,'@registry,medium,-239,'-3 dB margin");
    const out = parseWatchBandCsv(csv);
    expect(out.errors).toEqual([]);
    expect(out.valid[0]!.band).toMatchObject({ name: '=cmd|calc', reason: '+44 reserved', source: '@registry', notes: '-3 dB margin', thresholdDbWPerM2Hz: -239 });
  });
});

describe('parseWatchBandCsv', () => {
  it('reads back everything it wrote: the whole starter set', () => {
    const rows = STARTER_WATCH_BANDS.map((b) => band({ ...b, thresholdDbWPerM2Hz: b.thresholdDbWPerM2Hz ?? null, notes: null }));
    const out = parseWatchBandCsv(watchBandsToCsv(rows));
    expect(out.errors).toEqual([]);
    expect(out.valid).toHaveLength(rows.length);
    out.valid.forEach(({ band: read }, i) => {
      const want = rows[i]!;
      expect(read).toMatchObject({ name: want.name, reason: want.reason, source: want.source, severity: want.severity, thresholdDbWPerM2Hz: want.thresholdDbWPerM2Hz });
      expect(read.lowerHz).toBeCloseTo(want.lowerHz, 3);
      expect(read.upperHz).toBeCloseTo(want.upperHz, 3);
    });
  });

  it('reports each bad row with the line it starts on, counting quoted line breaks', () => {
    const csv = [
      'name,lower_MHz,upper_MHz,reason,source,severity',
      'Good,1,2,Fine,Invented,low', // line 2
      'Multi,3,4,"spans', // line 3, continues on line 4
      'two lines",Invented,high',
      'Backwards,20,10,Edges swapped,Invented,low', // line 5
      '',
      'Words,ten,12,Not a number,Invented,low', // line 7
      'Loud,1,2,Unknown severity,Invented,extreme', // line 8
      'Good,5,6,Same name again,Invented,low', // line 9
      ',5,6,,Invented,low', // line 10: no name, no reason
    ].join('\n');
    const out = parseWatchBandCsv(csv);
    expect(out.rows).toBe(7);
    expect(out.valid.map((v) => [v.line, v.band.name])).toEqual([
      [2, 'Good'],
      [3, 'Multi'],
    ]);
    expect(out.valid[1]!.band.reason).toBe('spans\ntwo lines');
    expect(out.errors).toEqual([
      { line: 5, messages: ['upper_MHz: The upper edge must be above the lower edge.'] },
      { line: 7, messages: ['lower_MHz "ten" is not a number.'] },
      { line: 8, messages: ['severity "extreme" is not one of low, medium, high, critical.'] },
      { line: 9, messages: ['A band named "Good" appears earlier in the file.'] },
      { line: 10, messages: ['name: Give the band a name.', 'reason: Say why the band is protected.'] },
    ]);
  });

  it('refuses a header without the needed columns, or with ones it does not know, naming them', () => {
    expect(parseWatchBandCsv('name,lower,upper\nx,1,2\n').errors[0]!.messages[0]).toMatch(/^The header lacks lower_MHz, upper_MHz, reason, source, severity/);
    expect(parseWatchBandCsv('name,lower_MHz,upper_MHz,reason,source,severity,lower_GHz\nx,1,2,r,s,low,3\n').errors[0]!.messages[0]).toMatch(/^Unknown column lower_GHz/);
    expect(parseWatchBandCsv('').errors[0]!.messages).toEqual(['The file is empty.']);
  });

  it('accepts a BOM, CRLF, spaces around the header, any-case severity and blank optional columns', () => {
    const out = parseWatchBandCsv('\uFEFF name , lower_MHz,upper_MHz,reason,source,severity,threshold_dBW_per_m2_Hz,notes\r\nX,1.5,2.5,R,S,HIGH,,\r\n');
    expect(out.errors).toEqual([]);
    expect(out.valid[0]!.band).toMatchObject({ name: 'X', lowerHz: 1.5e6, upperHz: 2.5e6, severity: 'high', thresholdDbWPerM2Hz: null, notes: null });
  });
});
