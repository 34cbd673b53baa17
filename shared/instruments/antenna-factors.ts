/**
 * Antenna-factor tables from CSV (issue 6 §7): two columns, frequency in MHz and antenna factor in dB/m,
 * one point per row, frequencies strictly ascending. A header row is optional and recognised by its words
 * ("freq…", "…factor…" / "AF"); a header naming other units (GHz, kHz, dB/m is required for the factor)
 * is refused rather than silently misread. Errors carry the 1-based line number in the file.
 */
import Papa from 'papaparse';

export interface AntennaFactorPoint {
  frequencyMHz: number;
  antennaFactorDbPerM: number;
}

export interface AntennaFactorRowError {
  /** 1-based line number in the file (the header, if any, is line 1). */
  row: number;
  message: string;
}

export type AntennaFactorParse = { ok: true; points: AntennaFactorPoint[] } | { ok: false; errors: AntennaFactorRowError[] };

/** Plausible antenna factors of survey antennas lie well inside this range, dB/m (common practice). */
export const ANTENNA_FACTOR_RANGE_DB_PER_M = [-40, 100] as const;
export const ANTENNA_FACTOR_MAX_POINTS = 10_000;
const MAX_ERRORS = 50;

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

function parseNumber(cell: string | undefined): number | null {
  const text = (cell ?? '').trim();
  return NUMBER.test(text) ? Number(text) : null;
}

function headerProblem(cells: string[]): string | null {
  const [f = '', af = ''] = cells.map((c) => c.trim().toLowerCase());
  if (!/freq/.test(f)) return 'The first column must be the frequency (MHz).';
  if (/ghz|khz|\bhz\b/.test(f.replace('mhz', ''))) return 'Give the frequency in MHz.';
  if (!/factor|\baf\b/.test(af)) return 'The second column must be the antenna factor (dB/m).';
  if (/db\s*\/?\s*\(?µ|dbuv|db\(1\/m\)x/.test(af)) return 'Give the antenna factor in dB/m.';
  return null;
}

export function parseAntennaFactorCsv(text: string): AntennaFactorParse {
  const clean = text.replace(/^\uFEFF/, '');
  // The delimiter is read off the first data-bearing line (Papa's own guess is thrown by comment lines);
  // comments are skipped here rather than by Papa so that line numbers stay those of the file.
  const isContent = (line: string) => line.trim() !== '' && !line.trim().startsWith('#');
  const firstLine = clean.split(/\r?\n/).find(isContent) ?? '';
  const delimiter = firstLine.includes('\t') ? '\t' : firstLine.includes(';') && !firstLine.includes(',') ? ';' : ',';
  const rows = Papa.parse<string[]>(clean, { skipEmptyLines: false, delimiter }).data;
  const headerIndex = rows.findIndex((cells) => isContent(cells.join(delimiter)));
  const errors: AntennaFactorRowError[] = [];
  const points: AntennaFactorPoint[] = [];
  let previousMHz = -Infinity;
  rows.forEach((cells, index) => {
    const line = index + 1;
    if (errors.length >= MAX_ERRORS) return;
    if (cells.every((c) => c.trim() === '')) return;
    if (cells[0]?.trim().startsWith('#')) return; // comment lines
    const frequencyMHz = parseNumber(cells[0]);
    if (frequencyMHz === null && index === headerIndex) {
      const problem = headerProblem(cells);
      if (problem) errors.push({ row: line, message: problem });
      return;
    }
    if (cells.filter((c) => c.trim() !== '').length !== 2) {
      errors.push({ row: line, message: `Expected 2 values (frequency in MHz, antenna factor in dB/m), found ${cells.filter((c) => c.trim() !== '').length}.` });
      return;
    }
    const factor = parseNumber(cells[1]);
    if (frequencyMHz === null) {
      errors.push({ row: line, message: `The frequency "${cells[0]?.trim()}" is not a number.` });
      return;
    }
    if (factor === null) {
      errors.push({ row: line, message: `The antenna factor "${cells[1]?.trim()}" is not a number.` });
      return;
    }
    if (!(frequencyMHz > 0)) {
      errors.push({ row: line, message: 'The frequency must be greater than 0 MHz.' });
      return;
    }
    if (frequencyMHz <= previousMHz) {
      errors.push({ row: line, message: `Frequencies must increase from row to row (${frequencyMHz} MHz follows ${previousMHz} MHz).` });
      return;
    }
    if (factor < ANTENNA_FACTOR_RANGE_DB_PER_M[0] || factor > ANTENNA_FACTOR_RANGE_DB_PER_M[1]) {
      errors.push({ row: line, message: `An antenna factor of ${factor} dB/m is outside ${ANTENNA_FACTOR_RANGE_DB_PER_M[0]}…${ANTENNA_FACTOR_RANGE_DB_PER_M[1]} dB/m: check the unit.` });
      return;
    }
    previousMHz = frequencyMHz;
    points.push({ frequencyMHz, antennaFactorDbPerM: factor });
  });
  if (errors.length > 0) return { ok: false, errors };
  if (points.length < 2) return { ok: false, errors: [{ row: rows.length, message: 'The table needs at least two frequency points.' }] };
  if (points.length > ANTENNA_FACTOR_MAX_POINTS) return { ok: false, errors: [{ row: rows.length, message: `The table may have at most ${ANTENNA_FACTOR_MAX_POINTS} points.` }] };
  return { ok: true, points };
}

/** Writes points back as the canonical CSV that is stored (header + one row per point). */
export function antennaFactorCsv(points: readonly AntennaFactorPoint[]): string {
  return ['frequency_mhz,antenna_factor_db_per_m', ...points.map((p) => `${p.frequencyMHz},${p.antennaFactorDbPerM}`)].join('\n') + '\n';
}
