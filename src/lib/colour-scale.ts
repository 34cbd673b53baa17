/**
 * The field colour scale of the capture plan view and the survey map (one scale, so a station looks
 * the same colour on both): |B| on a log axis mapped onto a ramp of our own, interpolated
 * in OKLab (B. Ottosson, "A perceptual color space for image processing", 2020) so equal steps of
 * log|B| look like equal steps of colour. Lightness rises monotonically from a deep indigo to a pale
 * yellow, so the order survives greyscale, dim screens and the common colour-vision deficiencies.
 *
 * Fringe fields fall off roughly as 1/r³ (REFERENCES.md), so a linear scale would paint all but the
 * nearest stations one colour: log|B| is what a surveyor reads.
 */

/** Ramp anchors in OKLab (L, a, b), our own choice; L strictly increasing. */
const RAMP_OKLAB: ReadonlyArray<readonly [number, number, number]> = [
  [0.3, 0.06, -0.13],
  [0.43, -0.01, -0.11],
  [0.56, -0.07, -0.05],
  [0.68, -0.12, 0.03],
  [0.8, -0.08, 0.12],
  [0.92, -0.01, 0.15],
];

/** A log-|B| domain [minT, maxT], both > 0, min < max. */
export interface FieldDomain {
  minT: number;
  maxT: number;
}

/** Used when a level has no readings yet: 10 µT (below the Earth's field) to 100 mT. */
export const DEFAULT_FIELD_DOMAIN: FieldDomain = { minT: 1e-5, maxT: 1e-1 };

/** Colour for stations with no reading yet (drawn hollow by the plan view). */
export const NO_READING_COLOUR = '#8b938f';

function oklabToLinearSrgb(L: number, a: number, b: number): [number, number, number] {
  // Ottosson (2020), OKLab → LMS' → LMS → linear sRGB.
  const l_ = L + 0.3963377774 * a + 0.2158037573 * b;
  const m_ = L - 0.1055613458 * a - 0.0638541728 * b;
  const s_ = L - 0.0894841775 * a - 1.291485548 * b;
  const l = l_ ** 3;
  const m = m_ ** 3;
  const s = s_ ** 3;
  return [
    4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s,
    -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s,
    -0.0041960863 * l - 0.7034186147 * m + 1.707614701 * s,
  ];
}

function linearToSrgbByte(c: number): number {
  const clamped = Math.min(1, Math.max(0, c));
  // IEC 61966-2-1 sRGB transfer function.
  const encoded = clamped <= 0.0031308 ? 12.92 * clamped : 1.055 * clamped ** (1 / 2.4) - 0.055;
  return Math.round(encoded * 255);
}

function hex(r: number, g: number, b: number): string {
  return `#${[r, g, b].map((v) => v.toString(16).padStart(2, '0')).join('')}`;
}

/** The ramp colour at t ∈ [0, 1] (clamped), as #rrggbb. */
export function rampColour(t: number): string {
  const clamped = Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0;
  const scaled = clamped * (RAMP_OKLAB.length - 1);
  const i = Math.min(RAMP_OKLAB.length - 2, Math.floor(scaled));
  const f = scaled - i;
  const a = RAMP_OKLAB[i] as readonly [number, number, number];
  const b = RAMP_OKLAB[i + 1] as readonly [number, number, number];
  const [r, g, bl] = oklabToLinearSrgb(a[0] + (b[0] - a[0]) * f, a[1] + (b[1] - a[1]) * f, a[2] + (b[2] - a[2]) * f);
  return hex(linearToSrgbByte(r), linearToSrgbByte(g), linearToSrgbByte(bl));
}

/** Position of |B| on the log domain, 0..1 (clamped); fields ≤ 0 sit at 0. */
export function fieldPosition(fieldT: number, domain: FieldDomain): number {
  if (!(fieldT > 0)) return 0;
  const lo = Math.log10(domain.minT);
  const hi = Math.log10(domain.maxT);
  return Math.min(1, Math.max(0, (Math.log10(fieldT) - lo) / (hi - lo)));
}

/** Colour of a station's latest |B| (tesla), or the no-reading grey for null. */
export function fieldColour(fieldT: number | null, domain: FieldDomain): string {
  return fieldT === null ? NO_READING_COLOUR : rampColour(fieldPosition(fieldT, domain));
}

/**
 * Whole decades covering the fields given (at least two decades wide so one reading still gets a
 * readable legend); the default domain when there are no positive fields.
 */
export function fieldDomainFor(fieldsT: Iterable<number | null>): FieldDomain {
  let min = Infinity;
  let max = -Infinity;
  for (const f of fieldsT) {
    if (f === null || !(f > 0) || !Number.isFinite(f)) continue;
    if (f < min) min = f;
    if (f > max) max = f;
  }
  if (!Number.isFinite(min)) return DEFAULT_FIELD_DOMAIN;
  let lo = Math.floor(Math.log10(min));
  let hi = Math.ceil(Math.log10(max));
  if (hi - lo < 2) {
    const missing = 2 - (hi - lo);
    lo -= Math.floor(missing / 2);
    hi += Math.ceil(missing / 2);
  }
  return { minT: decade(lo), maxT: decade(hi) };
}

/** 10^e exactly (10 ** -5 is 9.999…e-6 in floating point; the literal 1e-5 is not). */
export function decade(e: number): number {
  return Number(`1e${e}`);
}

/** Decade ticks of the domain (tesla), for the legend. */
export function decadeTicks(domain: FieldDomain): number[] {
  const ticks: number[] = [];
  for (let e = Math.round(Math.log10(domain.minT)); e <= Math.round(Math.log10(domain.maxT)); e++) ticks.push(decade(e));
  return ticks;
}

/** CSS linear-gradient stops of the ramp (left = low field). */
export function rampGradientCss(steps = 12): string {
  const stops: string[] = [];
  for (let i = 0; i <= steps; i++) stops.push(`${rampColour(i / steps)} ${((i / steps) * 100).toFixed(1)}%`);
  return `linear-gradient(to right, ${stops.join(', ')})`;
}
