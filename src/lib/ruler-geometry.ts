/**
 * Geometry of the frequency ruler (capture's feedback panel, a room's EMC page): a log-frequency axis
 * (cyclotron lines are proportional to |B|, and |B| spans decades across a site), decade ticks, and the
 * placement of line ticks and watch-band spans in SVG user units.
 */

export interface RulerDomain {
  lowHz: number;
  highHz: number;
}

/** Whole decades around the lines: one decade of margin below the lowest and above the highest. */
export function rulerDomainFor(frequenciesHz: readonly number[]): RulerDomain {
  const positive = frequenciesHz.filter((f) => f > 0 && Number.isFinite(f));
  if (positive.length === 0) return { lowHz: 1e6, highHz: 1e10 };
  const lo = Math.floor(Math.log10(Math.min(...positive)));
  const hi = Math.ceil(Math.log10(Math.max(...positive)));
  return { lowHz: Number(`1e${lo}`), highHz: Number(`1e${Math.max(hi, lo + 1)}`) };
}

/** x of a frequency on a log axis of the given width (clamped to the axis). */
export function rulerX(frequencyHz: number, domain: RulerDomain, widthPx: number): number {
  if (!(frequencyHz > 0)) return 0;
  const lo = Math.log10(domain.lowHz);
  const hi = Math.log10(domain.highHz);
  const t = (Math.log10(frequencyHz) - lo) / (hi - lo);
  return Math.min(widthPx, Math.max(0, t * widthPx));
}

/** A span [x0, x1] on the axis, or null when the band lies wholly outside the domain. */
export function rulerSpan(lowHz: number, highHz: number, domain: RulerDomain, widthPx: number): { x0: number; x1: number } | null {
  if (highHz < domain.lowHz || lowHz > domain.highHz) return null;
  return { x0: rulerX(Math.max(lowHz, domain.lowHz), domain, widthPx), x1: rulerX(Math.min(highHz, domain.highHz), domain, widthPx) };
}

/** Decade ticks of the domain with short labels ("1 MHz", "10 GHz"). */
export function rulerTicks(domain: RulerDomain): Array<{ frequencyHz: number; label: string }> {
  const ticks: Array<{ frequencyHz: number; label: string }> = [];
  for (let e = Math.round(Math.log10(domain.lowHz)); e <= Math.round(Math.log10(domain.highHz)); e++) {
    const units: Array<[number, string]> = [
      [9, 'GHz'],
      [6, 'MHz'],
      [3, 'kHz'],
      [0, 'Hz'],
    ];
    const [exp, unit] = units.find(([u]) => e >= u) ?? [0, 'Hz'];
    ticks.push({ frequencyHz: Number(`1e${e}`), label: `${Number(`1e${e - exp}`)} ${unit}` });
  }
  return ticks;
}
