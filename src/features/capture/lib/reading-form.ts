/**
 * The field-reading form: what the surveyor types (strings, in the unit they picked) and the zod
 * schema that turns it into the SI fields of a FieldReading (shared/schemas/capture.ts), with one
 * specific message per box. Used through react-hook-form's zodResolver.
 *
 * An implausible |B| (above 10 T or below 1 nT) is not refused: the schema asks for the confirmation
 * box to be ticked. 10 T is above every fringe field and most magnet bores; 1 nT is far below the
 * Earth's field (22–67 µT, World Magnetic Model; REFERENCES.md), so either is more likely a wrong
 * unit than a real value.
 */
import { z } from 'zod';
import { FieldReadingSchema } from '@shared/schemas/capture';
import { FieldUnitSchema, ProbeOrientationSchema, type FIELD_UNITS, type PROBE_ORIENTATIONS } from '@shared/schemas/vocabulary';
import { formatFluxDensity } from '@shared/units';
import { parseQuantityField } from './parse-quantity-field';

export type FieldUnit = (typeof FIELD_UNITS)[number];
export type ProbeOrientation = (typeof PROBE_ORIENTATIONS)[number];

/** Units offered in the picker (issue 4 §4), in order of the field they suit. */
export const PICKER_FIELD_UNITS: readonly FieldUnit[] = ['T', 'mT', 'µT', 'G', 'kG'];

export const IMPLAUSIBLE_HIGH_T = 10;
export const IMPLAUSIBLE_LOW_T = 1e-9;

export const PROBE_ORIENTATION_LABELS: Record<ProbeOrientation, string> = {
  three_axis: 'Three-axis probe',
  vertical: 'Vertical',
  horizontal: 'Horizontal',
  toward_source: 'Pointing at the magnet',
  other: 'Other (say in notes)',
};

export interface ReadingFormValues {
  mode: 'magnitude' | 'components';
  magnitude: string;
  bx: string;
  by: string;
  bz: string;
  unit: FieldUnit;
  instrumentId: string;
  probeOrientation: ProbeOrientation;
  height: string;
  background: string;
  zeroed: boolean;
  notes: string;
  confirmImplausible: boolean;
}

export function emptyReadingForm(unit: FieldUnit = 'mT', instrumentId = ''): ReadingFormValues {
  return {
    mode: 'magnitude',
    magnitude: '',
    bx: '',
    by: '',
    bz: '',
    unit,
    instrumentId,
    probeOrientation: 'three_axis',
    height: '1.0',
    background: '',
    zeroed: false,
    notes: '',
    confirmImplausible: false,
  };
}

/** The SI fields of a reading, ready to be completed with ids and saved. */
export interface ParsedReading {
  magnitudeT: number | null;
  bxT: number | null;
  byT: number | null;
  bzT: number | null;
  /** |B| whichever way it was entered. */
  fieldT: number;
  unit: FieldUnit;
  instrumentId: string | null;
  probeOrientation: ProbeOrientation;
  heightM: number;
  backgroundT: number | null;
  zeroed: boolean;
  notes: string | null;
}

type Field = keyof ReadingFormValues;
type Issue = { path: Field; message: string };

/** |B| from the values typed so far, or null while it cannot be read (for the live feedback). */
export function liveFieldTesla(values: Pick<ReadingFormValues, 'mode' | 'magnitude' | 'bx' | 'by' | 'bz' | 'unit'>): number | null {
  if (values.mode === 'magnitude') {
    const r = parseQuantityField('fluxDensity', '|B|', values.magnitude, values.unit);
    return r.ok ? r.value : null;
  }
  const parts = [values.bx, values.by, values.bz].map((t) => parseQuantityField('fluxDensity', 'B', t, values.unit, { signed: true }));
  if (!parts.every((p) => p.ok)) return null;
  return Math.hypot(...parts.map((p) => (p as { value: number }).value));
}

export function isImplausibleField(fieldT: number): boolean {
  return fieldT > IMPLAUSIBLE_HIGH_T || fieldT < IMPLAUSIBLE_LOW_T;
}

export function implausibleMessage(fieldT: number, unit: FieldUnit): string {
  const shown = formatFluxDensity(fieldT, { unit });
  return fieldT > IMPLAUSIBLE_HIGH_T
    ? `${shown} is above 10 T — more than any fringe field. Check the unit (${unit}), then confirm if it is right.`
    : `${shown} is below 1 nT — far below the Earth's field. Check the unit (${unit}), then confirm if it is right.`;
}

/** Validates one value against the shared record schema's own field rule (its message on failure). */
function checkShared(schema: z.ZodType, value: unknown): string | null {
  const r = schema.safeParse(value);
  return r.success ? null : (r.error.issues[0]?.message ?? 'Not valid.');
}

function parseReading(v: ReadingFormValues, issues: Issue[]): ParsedReading | null {
  const shape = FieldReadingSchema.shape;
  let magnitudeT: number | null = null;
  let bxT: number | null = null;
  let byT: number | null = null;
  let bzT: number | null = null;
  if (v.mode === 'magnitude') {
    const r = parseQuantityField('fluxDensity', '|B|', v.magnitude, v.unit);
    if (r.ok) magnitudeT = r.value;
    else issues.push({ path: 'magnitude', message: r.message });
  } else {
    const axes = [
      ['bx', 'Bx', v.bx],
      ['by', 'By', v.by],
      ['bz', 'Bz', v.bz],
    ] as const;
    const values = axes.map(([path, label, text]) => {
      const r = parseQuantityField('fluxDensity', label, text, v.unit, { signed: true });
      if (!r.ok) issues.push({ path, message: r.message });
      return r.ok ? r.value : null;
    });
    bxT = values[0] ?? null;
    byT = values[1] ?? null;
    bzT = values[2] ?? null;
  }
  const height = parseQuantityField('length', 'Probe height', v.height, 'm');
  if (!height.ok) issues.push({ path: 'height', message: height.message });
  else {
    const problem = checkShared(shape.heightM, height.value);
    if (problem) issues.push({ path: 'height', message: problem });
    else if (height.value > 20) issues.push({ path: 'height', message: 'Probe height is over 20 m above the floor: enter it in metres (e.g. 1.2) or with a unit (120 cm).' });
  }
  let backgroundT: number | null = null;
  if (v.background.trim() !== '') {
    const r = parseQuantityField('fluxDensity', 'Background', v.background, v.unit);
    if (r.ok) backgroundT = r.value;
    else issues.push({ path: 'background', message: r.message });
  }
  if (v.notes.length > 4000) issues.push({ path: 'notes', message: 'Notes are limited to 4,000 characters.' });
  const unitOk = FieldUnitSchema.safeParse(v.unit).success;
  if (!unitOk) issues.push({ path: 'unit', message: 'Choose a unit.' });
  if (!ProbeOrientationSchema.safeParse(v.probeOrientation).success) issues.push({ path: 'probeOrientation', message: 'Choose how the probe was held.' });

  const fieldOk = v.mode === 'magnitude' ? magnitudeT !== null : bxT !== null && byT !== null && bzT !== null;
  if (!fieldOk) return null;
  const fieldT = magnitudeT ?? Math.hypot(bxT ?? 0, byT ?? 0, bzT ?? 0);
  if (isImplausibleField(fieldT) && !v.confirmImplausible) {
    issues.push({ path: 'confirmImplausible', message: implausibleMessage(fieldT, v.unit) });
  }
  if (issues.length > 0 || !height.ok) return null;
  return {
    magnitudeT,
    bxT,
    byT,
    bzT,
    fieldT,
    unit: v.unit,
    instrumentId: v.instrumentId === '' ? null : v.instrumentId,
    probeOrientation: v.probeOrientation,
    heightM: height.value,
    backgroundT,
    zeroed: v.zeroed,
    notes: v.notes.trim() === '' ? null : v.notes.trim(),
  };
}

/** The form schema (input: ReadingFormValues, output: ParsedReading) for zodResolver. */
export const ReadingFormSchema = z
  .object({
    mode: z.enum(['magnitude', 'components']),
    magnitude: z.string(),
    bx: z.string(),
    by: z.string(),
    bz: z.string(),
    unit: z.string(),
    instrumentId: z.string(),
    probeOrientation: z.string(),
    height: z.string(),
    background: z.string(),
    zeroed: z.boolean(),
    notes: z.string(),
    confirmImplausible: z.boolean(),
  })
  .transform((values, ctx) => {
    const issues: Issue[] = [];
    const parsed = parseReading(values as ReadingFormValues, issues);
    for (const issue of issues) ctx.addIssue({ code: 'custom', path: [issue.path], message: issue.message });
    return parsed ?? z.NEVER;
  });

/** The same parse outside the form (tests, the benchmark): errors by field, or the parsed reading. */
export function parseReadingForm(values: ReadingFormValues): { ok: true; value: ParsedReading } | { ok: false; errors: Partial<Record<Field, string>> } {
  const result = ReadingFormSchema.safeParse(values);
  if (result.success) return { ok: true, value: result.data };
  const errors: Partial<Record<Field, string>> = {};
  for (const issue of result.error.issues) {
    const key = issue.path[0] as Field;
    errors[key] ??= issue.message;
  }
  return { ok: false, errors };
}

/** Form values showing an existing reading (for editing), in the unit it was typed in. */
export function readingToForm(r: {
  magnitudeT: number | null;
  bxT: number | null;
  byT: number | null;
  bzT: number | null;
  unit: FieldUnit;
  instrumentId: string | null;
  probeOrientation: ProbeOrientation;
  heightM: number;
  backgroundT: number | null;
  zeroed: boolean;
  notes: string | null;
}): ReadingFormValues {
  const inUnit = (t: number | null) => (t === null ? '' : formatNumberInUnit(t, r.unit));
  return {
    mode: r.magnitudeT !== null ? 'magnitude' : 'components',
    magnitude: inUnit(r.magnitudeT),
    bx: inUnit(r.bxT),
    by: inUnit(r.byT),
    bz: inUnit(r.bzT),
    unit: r.unit,
    instrumentId: r.instrumentId ?? '',
    probeOrientation: r.probeOrientation,
    height: String(r.heightM),
    background: inUnit(r.backgroundT),
    zeroed: r.zeroed,
    notes: r.notes ?? '',
    confirmImplausible: r.magnitudeT !== null ? isImplausibleField(r.magnitudeT) : false,
  };
}

/** A number in the given unit as plain text, up to 6 significant digits, signed. */
function formatNumberInUnit(valueT: number, unit: FieldUnit): string {
  const text = formatFluxDensity(Math.abs(valueT), { unit, significantDigits: 6 });
  const number = text.slice(0, text.lastIndexOf(' '));
  const trimmed = number.includes('e') ? number : number.replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '');
  return valueT < 0 ? `-${trimmed}` : trimmed;
}
