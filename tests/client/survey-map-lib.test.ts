/**
 * The survey map's client-side helpers: the colour ramp, checked with the `color` package (a
 * general-purpose colour library; CIELAB L* and CIE76 ΔE from its own conversions), the legend's
 * units (1 G = 10⁻⁴ T exactly, BIPM SI Brochure, 9th ed., table 8), and the plan frame against the
 * calibration formulas of shared/plans (x_m = (x_px − origin_x)·mpp, y_m = (origin_y − y_px)·mpp).
 */
import Color from 'color';
import { describe, expect, it } from 'vitest';
import { pixelToPlanM } from '@shared/plans/calibration';
import { decadeTicks, fieldColour, fieldDomainFor, NO_READING_COLOUR, rampColour } from '@/lib/colour-scale';
import { planImageBoundsM, pointsBoundsM } from '@/lib/plan-frame';
import { fieldLabel } from '@/features/survey-map/lib/units';

const lab = (hex: string) => {
  const [l, a, b] = Color(hex).lab().array() as [number, number, number];
  return { l, a, b };
};

describe('the map colour ramp', () => {
  const samples = Array.from({ length: 21 }, (_, i) => lab(rampColour(i / 20)));

  it('rises in lightness from one end to the other, so the order survives greyscale', () => {
    for (let i = 1; i < samples.length; i++) expect(samples[i]!.l).toBeGreaterThan(samples[i - 1]!.l);
    expect(samples.at(-1)!.l - samples[0]!.l).toBeGreaterThan(50);
  });

  it('takes near-equal perceptual steps for equal steps of log|B| (CIE76 ΔE within a factor 2.5)', () => {
    const steps = samples.slice(1).map((s, i) => Math.hypot(s.l - samples[i]!.l, s.a - samples[i]!.a, s.b - samples[i]!.b));
    expect(Math.max(...steps) / Math.min(...steps)).toBeLessThan(2.5);
  });

  it('colours a station by the position of log|B| in whole decades, grey with no reading', () => {
    const domain = fieldDomainFor([2e-5, 3e-3, null]);
    expect(domain).toEqual({ minT: 1e-5, maxT: 1e-2 });
    expect(decadeTicks(domain)).toEqual([1e-5, 1e-4, 1e-3, 1e-2]);
    expect(fieldColour(1e-5, domain)).toBe(rampColour(0));
    expect(fieldColour(1e-2, domain)).toBe(rampColour(1));
    expect(fieldColour(10 ** -3.5, domain)).toBe(rampColour(0.5));
    expect(fieldColour(null, domain)).toBe(NO_READING_COLOUR);
  });
});

describe('legend labels', () => {
  it('shows a line in the chosen unit', () => {
    expect(fieldLabel(0.9e-3, 'mT')).toBe('0.9 mT');
    expect(fieldLabel(0.9e-3, 'G')).toBe('9 G'); // 1 G = 1e-4 T
    expect(fieldLabel(0.5e-3, 'µT')).toBe('500 µT');
  });
});

describe('the plan frame in metres', () => {
  it('puts the image corners where the calibration puts them', () => {
    const plan = { widthPx: 1200, heightPx: 800, metresPerPixel: 0.025, originXPx: 100, originYPx: 700 };
    const { bounds, calibrated } = planImageBoundsM(plan);
    const topLeft = pixelToPlanM({ xPx: 0, yPx: 0 }, { ...plan, northAngleDeg: 0 });
    const bottomRight = pixelToPlanM({ xPx: 1200, yPx: 800 }, { ...plan, northAngleDeg: 0 });
    expect(calibrated).toBe(true);
    expect(bounds[0][0]).toBeCloseTo(bottomRight.yM, 12); // south
    expect(bounds[0][1]).toBeCloseTo(topLeft.xM, 12); // west
    expect(bounds[1][0]).toBeCloseTo(topLeft.yM, 12); // north
    expect(bounds[1][1]).toBeCloseTo(bottomRight.xM, 12); // east
    expect(planImageBoundsM({ ...plan, metresPerPixel: null }).calibrated).toBe(false);
  });

  it('bounds scattered points with a margin, and nothing for no points', () => {
    expect(pointsBoundsM([[1, 2], [5, -3]], 1)).toEqual([[-4, 0], [3, 6]]);
    expect(pointsBoundsM([])).toBeNull();
  });
});
