/**
 * The sweep form (spectrum-analyser readings): what the surveyor types and the zod schema that turns it
 * into the SI fields of a Sweep (shared/schemas/capture.ts), with a message per box; and the check of
 * an optional trace file (CSV of frequency and level), read with papaparse.
 */
import { z } from 'zod';
import { PeakMarkerSchema, SweepSchema } from '@shared/schemas/capture';
import { readTraceRows } from '@shared/emc/trace-csv';
import { DetectorSchema, type DETECTORS } from '@shared/schemas/vocabulary';
import { parseDbmField, parseQuantityField } from './parse-quantity-field';

export type Detector = (typeof DETECTORS)[number];
export const FREQUENCY_UNITS = ['Hz', 'kHz', 'MHz', 'GHz'] as const;
export type FrequencyUnit = (typeof FREQUENCY_UNITS)[number];

export const DETECTOR_LABELS: Record<Detector, string> = {
  peak: 'Peak',
  quasi_peak: 'Quasi-peak',
  average: 'Average',
  rms: 'RMS',
  sample: 'Sample',
};

export interface PeakRowValues {
  frequency: string;
  unit: FrequencyUnit;
  level: string;
}

export interface SweepFormValues {
  analyserId: string;
  antennaId: string;
  start: string;
  startUnit: FrequencyUnit;
  stop: string;
  stopUnit: FrequencyUnit;
  rbw: string;
  rbwUnit: FrequencyUnit;
  referenceLevel: string;
  detector: Detector;
  peaks: PeakRowValues[];
  notes: string;
}

export function emptySweepForm(analyserId = '', antennaId = ''): SweepFormValues {
  return {
    analyserId,
    antennaId,
    start: '',
    startUnit: 'MHz',
    stop: '',
    stopUnit: 'MHz',
    rbw: '100',
    rbwUnit: 'kHz',
    referenceLevel: '0',
    detector: 'peak',
    peaks: [],
    notes: '',
  };
}

export interface ParsedSweep {
  analyserId: string | null;
  antennaId: string | null;
  startHz: number;
  stopHz: number;
  rbwHz: number;
  referenceLevelDbm: number;
  detector: Detector;
  peaks: Array<{ frequencyHz: number; levelDbm: number }>;
  notes: string | null;
}

type Issue = { path: Array<string | number>; message: string };

function parseSweep(v: SweepFormValues, issues: Issue[]): ParsedSweep | null {
  const shape = SweepSchema.shape;
  const start = parseQuantityField('frequency', 'Start frequency', v.start, v.startUnit);
  if (!start.ok) issues.push({ path: ['start'], message: start.message });
  const stop = parseQuantityField('frequency', 'Stop frequency', v.stop, v.stopUnit);
  if (!stop.ok) issues.push({ path: ['stop'], message: stop.message });
  const rbw = parseQuantityField('frequency', 'RBW', v.rbw, v.rbwUnit);
  if (!rbw.ok) issues.push({ path: ['rbw'], message: rbw.message });
  else {
    const r = shape.rbwHz.safeParse(rbw.value);
    if (!r.success) issues.push({ path: ['rbw'], message: r.error.issues[0]?.message ?? 'RBW is not valid.' });
  }
  const ref = parseDbmField('Reference level', v.referenceLevel);
  if (!ref.ok) issues.push({ path: ['referenceLevel'], message: ref.message });
  if (!DetectorSchema.safeParse(v.detector).success) issues.push({ path: ['detector'], message: 'Choose the detector.' });
  if (start.ok && stop.ok && !(start.value < stop.value)) issues.push({ path: ['stop'], message: 'Stop frequency must be above the start frequency.' });
  if (rbw.ok && start.ok && stop.ok && rbw.value > stop.value - start.value && stop.value > start.value) {
    issues.push({ path: ['rbw'], message: 'RBW is wider than the whole span: check its unit.' });
  }
  if (v.peaks.length > 200) issues.push({ path: ['peaks'], message: 'At most 200 peak markers.' });
  const peaks: Array<{ frequencyHz: number; levelDbm: number }> = [];
  v.peaks.forEach((p, i) => {
    const f = parseQuantityField('frequency', `Peak ${i + 1} frequency`, p.frequency, p.unit);
    const l = parseDbmField(`Peak ${i + 1} level`, p.level);
    if (!f.ok) issues.push({ path: ['peaks', i, 'frequency'], message: f.message });
    if (!l.ok) issues.push({ path: ['peaks', i, 'level'], message: l.message });
    if (f.ok && l.ok) {
      const marker = PeakMarkerSchema.safeParse({ frequencyHz: f.value, levelDbm: l.value });
      if (!marker.success) issues.push({ path: ['peaks', i, 'frequency'], message: marker.error.issues[0]?.message ?? 'Not valid.' });
      else if (start.ok && stop.ok && (f.value < start.value || f.value > stop.value)) {
        issues.push({ path: ['peaks', i, 'frequency'], message: `Peak ${i + 1} lies outside the sweep span.` });
      } else peaks.push(marker.data);
    }
  });
  if (v.notes.length > 4000) issues.push({ path: ['notes'], message: 'Notes are limited to 4,000 characters.' });
  if (issues.length > 0 || !start.ok || !stop.ok || !rbw.ok || !ref.ok) return null;
  return {
    analyserId: v.analyserId === '' ? null : v.analyserId,
    antennaId: v.antennaId === '' ? null : v.antennaId,
    startHz: start.value,
    stopHz: stop.value,
    rbwHz: rbw.value,
    referenceLevelDbm: ref.value,
    detector: v.detector,
    peaks,
    notes: v.notes.trim() === '' ? null : v.notes.trim(),
  };
}

const PeakRowSchema = z.object({ frequency: z.string(), unit: z.string(), level: z.string() });

/** The form schema (input: SweepFormValues, output: ParsedSweep) for zodResolver. */
export const SweepFormSchema = z
  .object({
    analyserId: z.string(),
    antennaId: z.string(),
    start: z.string(),
    startUnit: z.string(),
    stop: z.string(),
    stopUnit: z.string(),
    rbw: z.string(),
    rbwUnit: z.string(),
    referenceLevel: z.string(),
    detector: z.string(),
    peaks: z.array(PeakRowSchema),
    notes: z.string(),
  })
  .transform((values, ctx) => {
    const issues: Issue[] = [];
    const parsed = parseSweep(values as SweepFormValues, issues);
    for (const issue of issues) ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
    return parsed ?? z.NEVER;
  });

export function parseSweepForm(values: SweepFormValues): { ok: true; value: ParsedSweep } | { ok: false; errors: Record<string, string> } {
  const result = SweepFormSchema.safeParse(values);
  if (result.success) return { ok: true, value: result.data };
  const errors: Record<string, string> = {};
  for (const issue of result.error.issues) errors[issue.path.join('.')] ??= issue.message;
  return { ok: false, errors };
}

/** Form values showing an existing sweep, frequencies in MHz (the unit most spans are read in). */
export function sweepToForm(s: ParsedSweep): SweepFormValues {
  const mhz = (hz: number) => String(Number((hz / 1e6).toPrecision(10)));
  return {
    analyserId: s.analyserId ?? '',
    antennaId: s.antennaId ?? '',
    start: mhz(s.startHz),
    startUnit: 'MHz',
    stop: mhz(s.stopHz),
    stopUnit: 'MHz',
    rbw: String(Number((s.rbwHz / 1e3).toPrecision(10))),
    rbwUnit: 'kHz',
    referenceLevel: String(s.referenceLevelDbm),
    detector: s.detector,
    peaks: s.peaks.map((p) => ({ frequency: mhz(p.frequencyHz), unit: 'MHz', level: String(p.levelDbm) })),
    notes: s.notes ?? '',
  };
}

export type TraceCheck =
  | { ok: true; rows: number; minHz: number; maxHz: number; unit: FrequencyUnit }
  | { ok: false; message: string };

/**
 * Checks a trace file: rows of (frequency, level in dBm), comma/semicolon/tab separated, an optional
 * header row (whose first column may name the frequency unit, e.g. "Frequency (MHz)"; Hz otherwise).
 * Read by shared/emc/trace-csv.ts, as the server reads it.
 */
export function checkTraceCsv(text: string): TraceCheck {
  const read = readTraceRows(text);
  if (!read.ok) return read;
  let minHz = Infinity;
  let maxHz = -Infinity;
  for (const [hz] of read.points) {
    if (hz < minHz) minHz = hz;
    if (hz > maxHz) maxHz = hz;
  }
  return { ok: true, rows: read.points.length, minHz, maxHz, unit: read.unit };
}
