/**
 * Sweep trace files: rows of (frequency, level in dBm), comma, semicolon or tab separated, with an
 * optional header row whose first column may name the frequency unit ("Frequency (MHz)"); hertz
 * otherwise. The capture form checks a sweep's trace with {@link readTraceRows}; the server and the
 * charts read the points with {@link parseTraceCsv}; {@link traceToCsv} writes the same format back out
 * (the demo traces).
 */
import Papa from 'papaparse';

export const TRACE_FREQUENCY_UNITS = ['Hz', 'kHz', 'MHz', 'GHz'] as const;
export type TraceFrequencyUnit = (typeof TRACE_FREQUENCY_UNITS)[number];

const UNIT_FACTOR: Record<TraceFrequencyUnit, number> = { Hz: 1, kHz: 1e3, MHz: 1e6, GHz: 1e9 };

/** A trace file has at most this many points (a long analyser export is a few tens of thousands). */
export const TRACE_MAX_POINTS = 200_000;

/** One trace, as two parallel arrays sorted by frequency. */
export interface Trace {
  readonly frequencyHz: Float64Array;
  readonly levelDbm: Float64Array;
}

export type TraceParse = { ok: true; trace: Trace; unit: TraceFrequencyUnit } | { ok: false; message: string };

/**
 * The rows of a trace file as (Hz, dBm) in file order, after the header (if any) and with every row
 * checked; more than `maxRows` data rows is refused before any is read. The capture form's check and
 * {@link parseTraceCsv} both read files through this.
 */
export function readTraceRows(
  text: string,
  maxRows = Infinity,
): { ok: true; points: Array<[number, number]>; unit: TraceFrequencyUnit } | { ok: false; message: string } {
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: 'greedy' });
  const rows = parsed.data.filter((r) => r.some((c) => c.trim() !== ''));
  if (rows.length === 0) return { ok: false, message: 'The trace file is empty.' };
  let unit: TraceFrequencyUnit = 'Hz';
  let first = 0;
  const head = rows[0] as string[];
  if (head.length > 0 && !Number.isFinite(Number(head[0]))) {
    first = 1;
    const match = /\b(GHz|MHz|kHz|Hz)\b/i.exec(head[0] ?? '');
    if (match) unit = TRACE_FREQUENCY_UNITS.find((u) => u.toLowerCase() === (match[1] as string).toLowerCase()) ?? 'Hz';
  }
  const count = rows.length - first;
  if (count === 0) return { ok: false, message: 'The trace file has a header but no data rows.' };
  if (count > maxRows) return { ok: false, message: `The trace has ${count} points; at most ${maxRows} are read.` };
  const points: Array<[number, number]> = [];
  for (let i = first; i < rows.length; i++) {
    const row = rows[i] as string[];
    if (row.length < 2) return { ok: false, message: `Row ${i + 1} has ${row.length} column; a trace needs frequency and level.` };
    const f = Number((row[0] as string).trim());
    const level = Number((row[1] as string).trim());
    if (!Number.isFinite(f) || f <= 0) return { ok: false, message: `Row ${i + 1}: “${row[0]}” is not a frequency above 0.` };
    if (!Number.isFinite(level)) return { ok: false, message: `Row ${i + 1}: “${row[1]}” is not a level in dBm.` };
    points.push([f * UNIT_FACTOR[unit], level]);
  }
  return { ok: true, points, unit };
}

/** Reads a trace file; rows out of frequency order are sorted, repeated frequencies keep the last row. */
export function parseTraceCsv(text: string): TraceParse {
  const read = readTraceRows(text, TRACE_MAX_POINTS);
  if (!read.ok) return read;
  const points = read.points.sort((a, b) => a[0] - b[0]);
  const frequencyHz: number[] = [];
  const levelDbm: number[] = [];
  for (const [f, level] of points) {
    if (frequencyHz.length > 0 && frequencyHz[frequencyHz.length - 1] === f) levelDbm[levelDbm.length - 1] = level;
    else {
      frequencyHz.push(f);
      levelDbm.push(level);
    }
  }
  return { ok: true, trace: { frequencyHz: Float64Array.from(frequencyHz), levelDbm: Float64Array.from(levelDbm) }, unit: read.unit };
}

/** Writes a trace in the accepted format: a "Frequency (MHz),Level (dBm)" header, CRLF line ends. */
export function traceToCsv(trace: Trace, unit: TraceFrequencyUnit = 'MHz'): string {
  const factor = UNIT_FACTOR[unit];
  const lines = [`Frequency (${unit}),Level (dBm)`];
  for (let i = 0; i < trace.frequencyHz.length; i++) {
    lines.push(`${Number(((trace.frequencyHz[i] as number) / factor).toPrecision(12))},${Number((trace.levelDbm[i] as number).toFixed(2))}`);
  }
  return lines.join('\r\n') + '\r\n';
}
