/**
 * Watch bands as CSV (issue 8 §1): RFC 4180 (quoted where needed, CRLF line ends), one band per row,
 * frequencies in MHz with the unit in the header; text cells a spreadsheet would run as a formula get a
 * leading apostrophe (../csv/formula.ts). Only organisation-wide bands travel in the file; a
 * site's own bands (a scanner's receive band) are kept on the site.
 *
 * Reading checks every row and reports each bad one with its 1-based line number in the file (the
 * header is line 1), so nothing of a file with errors is imported unless the caller asks for the good rows.
 */
import Papa from 'papaparse';
import { protectCell, unprotectCell } from '../csv/formula';
import { WatchBandCreateSchema, type WatchBandCreate } from '../schemas/watch-band';

export const WATCH_BAND_CSV_COLUMNS = ['name', 'lower_MHz', 'upper_MHz', 'reason', 'source', 'severity', 'threshold_dBW_per_m2_Hz', 'notes'] as const;

export interface WatchBandCsvRow {
  name: string;
  lowerHz: number;
  upperHz: number;
  reason: string;
  source: string;
  severity: string;
  thresholdDbWPerM2Hz: number | null;
  notes: string | null;
}

/** MHz without float noise: 1575.42 MHz stays "1575.42", not "1575.4199999999998". */
const mhz = (hz: number) => String(Number((hz / 1e6).toPrecision(12)));

export function watchBandsToCsv(bands: readonly WatchBandCsvRow[]): string {
  // Text cells protected against spreadsheet formulas; the threshold (often negative) stays a number.
  const rows = bands.map((b) => [protectCell(b.name), mhz(b.lowerHz), mhz(b.upperHz), protectCell(b.reason), protectCell(b.source), b.severity, b.thresholdDbWPerM2Hz ?? '', protectCell(b.notes ?? '')]);
  return Papa.unparse({ fields: [...WATCH_BAND_CSV_COLUMNS], data: rows }, { newline: '\r\n', quotes: false }) + '\r\n';
}

export interface WatchBandCsvError {
  line: number;
  messages: string[];
}

export interface WatchBandCsvResult {
  valid: { line: number; band: WatchBandCreate }[];
  errors: WatchBandCsvError[];
  rows: number;
}

const number = (text: string): number | null => {
  const t = text.trim();
  if (t === '') return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : Number.NaN;
};

/** Each record of the file with the 1-based line it starts on (quoted fields may span lines). */
function records(text: string): { line: number; cells: string[] }[] {
  const lineStarts: number[] = [0];
  for (let i = 0; i < text.length; i++) if (text[i] === '\n') lineStarts.push(i + 1);
  const lineOf = (offset: number) => {
    let lo = 0;
    let hi = lineStarts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (lineStarts[mid]! <= offset) lo = mid;
      else hi = mid - 1;
    }
    return lo + 1;
  };
  const out: { line: number; cells: string[] }[] = [];
  let start = 0;
  Papa.parse<string[]>(text, {
    header: false,
    skipEmptyLines: false,
    step: (row) => {
      const cells = row.data;
      if (!(cells.length === 1 && cells[0]!.trim() === '')) out.push({ line: lineOf(start), cells });
      start = row.meta.cursor;
      while (text[start] === '\r' || text[start] === '\n') start++;
    },
  });
  return out;
}

const OPTIONAL_COLUMNS: readonly string[] = ['threshold_dBW_per_m2_Hz', 'notes'];

export function parseWatchBandCsv(input: string): WatchBandCsvResult {
  const text = input.replace(/^\uFEFF/, '');
  const [head, ...body] = records(text);
  if (!head) return { valid: [], rows: 0, errors: [{ line: 1, messages: ['The file is empty.'] }] };
  const header = head.cells.map((h) => h.trim());
  const missing = WATCH_BAND_CSV_COLUMNS.filter((c) => !OPTIONAL_COLUMNS.includes(c) && !header.includes(c));
  if (missing.length > 0) {
    return { valid: [], rows: body.length, errors: [{ line: head.line, messages: [`The header lacks ${missing.join(', ')}: the first line must name the columns ${WATCH_BAND_CSV_COLUMNS.join(', ')}.`] }] };
  }
  const unknown = header.filter((h) => !(WATCH_BAND_CSV_COLUMNS as readonly string[]).includes(h));
  if (unknown.length > 0) {
    return { valid: [], rows: body.length, errors: [{ line: head.line, messages: [`Unknown column${unknown.length > 1 ? 's' : ''} ${unknown.join(', ')}: the columns are ${WATCH_BAND_CSV_COLUMNS.join(', ')} (frequencies in MHz).`] }] };
  }

  const result: WatchBandCsvResult = { valid: [], errors: [], rows: body.length };
  const seen = new Set<string>();
  for (const { line, cells } of body) {
    const messages: string[] = [];
    if (cells.length !== header.length) messages.push(`The row has ${cells.length} fields; the header has ${header.length}.`);
    const raw = Object.fromEntries(header.map((h, i) => [h, cells[i] ?? ''])) as Record<string, string>;
    const lowerMHz = number(raw.lower_MHz ?? '');
    const upperMHz = number(raw.upper_MHz ?? '');
    const threshold = number(raw.threshold_dBW_per_m2_Hz ?? '');
    if (lowerMHz === null) messages.push('lower_MHz is empty.');
    else if (Number.isNaN(lowerMHz)) messages.push(`lower_MHz "${raw.lower_MHz}" is not a number.`);
    if (upperMHz === null) messages.push('upper_MHz is empty.');
    else if (Number.isNaN(upperMHz)) messages.push(`upper_MHz "${raw.upper_MHz}" is not a number.`);
    if (threshold !== null && Number.isNaN(threshold)) messages.push(`threshold_dBW_per_m2_Hz "${raw.threshold_dBW_per_m2_Hz}" is not a number.`);
    const candidate = {
      name: unprotectCell(raw.name ?? ''),
      lowerHz: lowerMHz === null || Number.isNaN(lowerMHz) ? undefined : lowerMHz * 1e6,
      upperHz: upperMHz === null || Number.isNaN(upperMHz) ? undefined : upperMHz * 1e6,
      reason: unprotectCell(raw.reason ?? ''),
      source: unprotectCell(raw.source ?? ''),
      severity: (raw.severity ?? '').trim().toLowerCase() || undefined,
      thresholdDbWPerM2Hz: threshold === null || Number.isNaN(threshold) ? null : threshold,
      notes: unprotectCell(raw.notes ?? '').trim() || null,
    };
    const checked = WatchBandCreateSchema.safeParse(candidate);
    if (!checked.success) {
      for (const issue of checked.error.issues) {
        const field = String(issue.path[0] ?? '');
        // An empty or non-numeric edge is already reported above in the file's own words.
        if ((field === 'lowerHz' && candidate.lowerHz === undefined) || (field === 'upperHz' && candidate.upperHz === undefined)) continue;
        if (field === 'severity') messages.push(`severity "${raw.severity ?? ''}" is not one of low, medium, high, critical.`);
        else messages.push(`${COLUMN_OF[field] ?? field}: ${issue.message}`);
      }
    }
    const key = candidate.name.trim().toLowerCase();
    if (key && seen.has(key)) messages.push(`A band named "${candidate.name.trim()}" appears earlier in the file.`);
    seen.add(key);
    if (messages.length > 0 || !checked.success) result.errors.push({ line, messages });
    else result.valid.push({ line, band: checked.data });
  }
  return result;
}

const COLUMN_OF: Record<string, string> = { lowerHz: 'lower_MHz', upperHz: 'upper_MHz', thresholdDbWPerM2Hz: 'threshold_dBW_per_m2_Hz' };
