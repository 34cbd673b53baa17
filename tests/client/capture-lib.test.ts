import Color from 'color';
import { describe, expect, it } from 'vitest';
import { cyclotronFrequencyHz } from '@shared/physics';
import { pointInPolygon, roomForPoint } from '@shared/plans/polygon';
import type { OfflineWatchBand, OfflineZoneSet } from '@shared/schemas/offline';
import { isCalibrationOverdue } from '@/features/capture/lib/calibration';
import { decadeTicks, fieldColour, fieldDomainFor, fieldPosition, rampColour } from '@/lib/colour-scale';
import { computeFieldFeedback } from '@/features/capture/lib/feedback';
import { nearestWithin } from '@/features/capture/lib/hit-test';
import { planImageBoundsM } from '@/lib/plan-frame';
import { emptyReadingForm, liveFieldTesla, parseReadingForm } from '@/features/capture/lib/reading-form';
import { rulerDomainFor, rulerSpan, rulerTicks, rulerX } from '@/lib/ruler-geometry';
import { checkTraceCsv, emptySweepForm, parseSweepForm } from '@/features/capture/lib/sweep-form';

const ORG = '00000000-0000-7000-8000-000000000001';
const band = (id: string, name: string, lowerHz: number, upperHz: number): OfflineWatchBand => ({
  id,
  organisationId: ORG,
  revision: 1,
  siteId: null,
  name,
  lowerHz,
  upperHz,
  reason: 'test',
  source: 'test',
  severity: 'medium',
});
// Band edges: ITU Radio Regulations (2020) RR 5.150 (ISM) and RR 5.340 (radio astronomy), REFERENCES.md.
const ISM_24 = band('00000000-0000-7000-8000-0000000000a1', 'ISM 2.4 GHz', 2400e6, 2500e6);
const RA_HI = band('00000000-0000-7000-8000-0000000000a2', 'Radio astronomy — H I line', 1400e6, 1427e6);
// Thresholds of IEC 60601-2-33 ed. 4 (0.9 mT, recalled; REFERENCES.md) with the common-practice 0.1 mT and 3 mT lines.
const ZONES: OfflineZoneSet = {
  id: '00000000-0000-7000-8000-0000000000b1',
  organisationId: ORG,
  revision: 1,
  name: 'MR safety lines',
  edition: 'IEC 60601-2-33:2022 (ed. 4)',
  thresholds: [
    { name: 'Projectile risk', fieldT: 3e-3, caution: 'Control what is carried in.' },
    { name: 'Sensitive equipment disturbed', fieldT: 1e-4, caution: 'Instruments may be disturbed.' },
    { name: 'B0 hazard boundary', fieldT: 9e-4, caution: 'People with implants stay outside.' },
  ],
};
const SETTINGS = { species: ['electron', 'proton'] as const, maxHarmonic: 3, zoneSet: ZONES, watchBands: [ISM_24, RA_HI] };

describe('colour scale', () => {
  it('gets lighter with every step up the ramp (CIELAB L* by the color package, a general-purpose reference)', () => {
    let previous = -Infinity;
    for (let i = 0; i <= 50; i++) {
      const l = Color(rampColour(i / 50)).lab().l();
      expect(l).toBeGreaterThan(previous);
      previous = l;
    }
  });

  it('is monotonic in log|B|: a higher field never gets an earlier colour', () => {
    const domain = { minT: 1e-5, maxT: 1e-1 };
    const fields = [2e-6, 1e-5, 3e-5, 1e-4, 5e-4, 9e-4, 3e-3, 2e-2, 8.75e-2, 0.1, 2];
    const lightness = fields.map((f) => Color(fieldColour(f, domain)).lab().l());
    for (let i = 1; i < fields.length; i++) expect(lightness[i]).toBeGreaterThanOrEqual(lightness[i - 1] as number);
    // On a log axis the geometric mean of the ends sits half-way (log10 of 1e-3 is the mean of −5 and −1).
    expect(fieldPosition(1e-3, domain)).toBeCloseTo(0.5, 12);
    expect(fieldPosition(1e-6, domain)).toBe(0);
    expect(fieldPosition(5, domain)).toBe(1);
  });

  it('covers the fields with whole decades, at least two wide', () => {
    expect(fieldDomainFor([3e-5, 2e-3, null])).toEqual({ minT: 1e-5, maxT: 1e-2 });
    const one = fieldDomainFor([5e-4]);
    expect(Math.log10(one.maxT / one.minT)).toBeCloseTo(2, 12);
    expect(fieldDomainFor([])).toEqual({ minT: 1e-5, maxT: 1e-1 });
    expect(decadeTicks({ minT: 1e-5, maxT: 1e-2 })).toHaveLength(4);
  });
});

describe('frequency ruler geometry', () => {
  it('places frequencies on a log axis: each decade the same width', () => {
    const domain = { lowHz: 1e6, highHz: 1e10 };
    expect(rulerX(1e6, domain, 400)).toBe(0);
    expect(rulerX(1e8, domain, 400)).toBeCloseTo(200, 9);
    expect(rulerX(1e9, domain, 400) - rulerX(1e8, domain, 400)).toBeCloseTo(100, 9);
    expect(rulerSpan(2400e6, 2500e6, domain, 400)?.x0).toBeCloseTo(400 * (Math.log10(2400e6) - 6) / 4, 9);
    expect(rulerSpan(1e11, 2e11, domain, 400)).toBeNull();
    expect(rulerTicks(domain).map((t) => t.label)).toEqual(['1 MHz', '10 MHz', '100 MHz', '1 GHz', '10 GHz']);
  });

  it('widens to whole decades around the lines', () => {
    expect(rulerDomainFor([1.33e6, 7.35e9])).toEqual({ lowHz: 1e6, highHz: 1e10 });
  });
});

describe('computed feedback', () => {
  it('puts the electron line at 87.5 mT inside the 2.4 GHz ISM band and names the band', () => {
    const fb = computeFieldFeedback(87.5e-3, 0.01, SETTINGS);
    expect(fb).not.toBeNull();
    const electron1 = fb!.lines.find((l) => l.speciesId === 'electron' && l.harmonic === 1)!;
    // NRL Plasma Formulary (2019): f_ce = 2.80e6 Hz per gauss × 875 G = 2.450 GHz (3 significant digits).
    expect(electron1.centreHz / 1e9).toBeCloseTo(2.45, 2);
    expect(electron1.centreHz).toBeCloseTo(cyclotronFrequencyHz('electron', 87.5e-3), 3);
    // Widened by the instrument's ±1 %.
    expect(electron1.lowHz).toBeCloseTo(electron1.centreHz * 0.99, 0);
    expect(electron1.highHz).toBeCloseTo(electron1.centreHz * 1.01, 0);
    expect(electron1.hits.map((h) => h.watchBandId)).toEqual([ISM_24.id]);
    // NRL: f_ci = 1.52e3·Z·μ⁻¹·B[G] Hz → 1.33 MHz for protons at 875 G.
    const proton1 = fb!.lines.find((l) => l.speciesId === 'proton' && l.harmonic === 1)!;
    expect(proton1.centreHz / 1e6).toBeCloseTo(1.33, 2);
    expect(fb!.lines).toHaveLength(6);
    expect(fb!.lines.find((l) => l.speciesId === 'electron' && l.harmonic === 2)!.centreHz).toBeCloseTo(2 * electron1.centreHz, 0);
    expect(fb!.hits).toHaveLength(1);
  });

  it('classes the station against the survey zone set with its caution', () => {
    expect(computeFieldFeedback(87.5e-3, 0, SETTINGS)!.classification.label).toBe('Projectile risk');
    const half = computeFieldFeedback(0.5e-3, 0, SETTINGS)!.classification;
    // 0.5 mT lies below edition 4's 0.9 mT B0 boundary (REFERENCES.md) but above the 0.1 mT equipment line.
    expect(half.label).toBe('Sensitive equipment disturbed');
    expect(half.cautions[0]).toBe('Instruments may be disturbed.');
    expect(half.cautions.some((c) => /follow local codes/.test(c))).toBe(true);
    expect(computeFieldFeedback(50e-6, 0, SETTINGS)!.classification.zoneIndex).toBe(-1);
  });

  it('puts the electron line of 50.7 mT into the H I radio-astronomy band (1420.4 MHz / 27.99 GHz/T)', () => {
    // Electron ≈ 27.99 GHz/T (CODATA 2018; REFERENCES.md): 1420.4 MHz / 27.99 GHz/T ≈ 50.75 mT.
    const fb = computeFieldFeedback(50.75e-3, 0.001, SETTINGS)!;
    expect(fb.hits.map((h) => h.watchBandId)).toContain(RA_HI.id);
  });

  it('gives nothing for a zero or unreadable field', () => {
    expect(computeFieldFeedback(0, 0, SETTINGS)).toBeNull();
    expect(computeFieldFeedback(Number.NaN, 0, SETTINGS)).toBeNull();
  });
});

// The capture screen finds the room under a tap with shared/plans (the site-setup module); these are
// the hand-computed cases the capture screen relies on.
describe('rooms and taps', () => {
  const square = [
    [0, 0],
    [4, 0],
    [4, 4],
    [0, 4],
  ] as const;
  // An L-shaped corridor: the notch (3, 3) is outside.
  const ell = [
    [0, 0],
    [6, 0],
    [6, 2],
    [2, 2],
    [2, 6],
    [0, 6],
  ] as const;
  it('finds points inside and outside by hand-computed cases', () => {
    expect(pointInPolygon(2, 2, square)).toBe(true);
    expect(pointInPolygon(5, 2, square)).toBe(false);
    expect(pointInPolygon(1, 5, ell)).toBe(true);
    expect(pointInPolygon(5, 1, ell)).toBe(true);
    expect(pointInPolygon(3, 3, ell)).toBe(false);
    expect(pointInPolygon(-0.1, 1, ell)).toBe(false);
  });
  it('picks the smallest room where rooms overlap, and null outside all', () => {
    const hall = { id: 'hall', polygon: ell };
    const cubicle = { id: 'cubicle', polygon: [[0.5, 0.5], [1.5, 0.5], [1.5, 1.5], [0.5, 1.5]] as const };
    expect(roomForPoint([hall, cubicle], 1, 1)?.id).toBe('cubicle');
    expect(roomForPoint([hall, cubicle], 5, 1)?.id).toBe('hall');
    expect(roomForPoint([hall, cubicle], 10, 10)).toBeNull();
  });
  it('hit-tests the nearest station within the radius', () => {
    const points = [
      { id: 'a', xM: 0, yM: 0 },
      { id: 'b', xM: 1, yM: 0 },
    ];
    expect(nearestWithin({ xM: 0.7, yM: 0 }, points, 0.5)?.id).toBe('b');
    expect(nearestWithin({ xM: 3, yM: 0 }, points, 0.5)).toBeNull();
  });
  it('lays the plan image out in metres from its calibration', () => {
    // 20 px per metre, origin at the bottom-left pixel: a 1200 × 800 px image is 60 m × 40 m.
    const { bounds, calibrated } = planImageBoundsM({ widthPx: 1200, heightPx: 800, metresPerPixel: 0.05, originXPx: 0, originYPx: 800 });
    expect(calibrated).toBe(true);
    expect(bounds[0][0]).toBeCloseTo(0, 12);
    expect(bounds[0][1]).toBeCloseTo(0, 12);
    expect(bounds[1][0]).toBeCloseTo(40, 12);
    expect(bounds[1][1]).toBeCloseTo(60, 12);
    const centred = planImageBoundsM({ widthPx: 100, heightPx: 100, metresPerPixel: 0.1, originXPx: 50, originYPx: 50 }).bounds;
    expect(centred[0][0]).toBeCloseTo(-5, 12);
    expect(centred[1][1]).toBeCloseTo(5, 12);
  });
});

describe('field reading form parsing', () => {
  const form = (patch: Partial<ReturnType<typeof emptyReadingForm>>) => ({ ...emptyReadingForm('mT'), ...patch });

  it('turns gauss into tesla (1 G = 1e-4 T exactly; NIST SP 811) and keeps the unit typed', () => {
    const r = parseReadingForm(form({ magnitude: '5', unit: 'G' }));
    expect(r.ok && r.value.magnitudeT).toBeCloseTo(5e-4, 15);
    expect(r.ok && r.value.unit).toBe('G');
  });

  it('derives |B| from three components (a 3-4-0 right triangle gives 5)', () => {
    const r = parseReadingForm(form({ mode: 'components', bx: '3', by: '-4', bz: '0', unit: 'mT' }));
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.value.fieldT).toBeCloseTo(5e-3, 15);
      expect(r.value.byT).toBeCloseTo(-4e-3, 15);
      expect(r.value.magnitudeT).toBeNull();
    }
    expect(liveFieldTesla(form({ mode: 'components', bx: '3', by: '-4', bz: '0' }))).toBeCloseTo(5e-3, 15);
  });

  it('says exactly what is wrong with each box', () => {
    const r = parseReadingForm(form({ magnitude: 'abc', height: '1,2', background: '-3' }));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors.magnitude).toMatch(/“abc” is not a number/);
      expect(r.errors.height).toMatch(/use a point for decimals/);
      expect(r.errors.background).toMatch(/cannot be negative/);
    }
    const empty = parseReadingForm(form({}));
    expect(!empty.ok && empty.errors.magnitude).toBe('Enter |B|.');
    const partial = parseReadingForm(form({ mode: 'components', bx: '1', by: '', bz: '2' }));
    expect(!partial.ok && partial.errors.by).toBe('Enter By.');
    const badUnit = parseReadingForm(form({ magnitude: '3 MT' }));
    expect(!badUnit.ok && badUnit.errors.magnitude).toMatch(/did you mean “mT”/);
  });

  it('asks for confirmation of an implausible value instead of refusing it', () => {
    const high = parseReadingForm(form({ magnitude: '12', unit: 'T' }));
    expect(!high.ok && high.errors.confirmImplausible).toMatch(/above 10 T/);
    expect(parseReadingForm(form({ magnitude: '12', unit: 'T', confirmImplausible: true })).ok).toBe(true);
    const low = parseReadingForm(form({ magnitude: '0.0001', unit: 'µT' }));
    expect(!low.ok && low.errors.confirmImplausible).toMatch(/below 1 nT/);
    expect(parseReadingForm(form({ magnitude: '87.5', unit: 'mT' })).ok).toBe(true);
  });
});

describe('calibration due dates', () => {
  it('is overdue from the day after the due date', () => {
    expect(isCalibrationOverdue('2026-06-30', new Date(2026, 5, 30, 18, 0))).toBe(false);
    expect(isCalibrationOverdue('2026-06-30', new Date(2026, 6, 1, 8, 0))).toBe(true);
    expect(isCalibrationOverdue(null, new Date(2030, 0, 1))).toBe(false);
  });
});

describe('sweep form parsing', () => {
  const form = (patch: Partial<ReturnType<typeof emptySweepForm>>) => ({ ...emptySweepForm(), start: '2300', stop: '2600', ...patch });
  it('parses a span with units and peak markers', () => {
    const r = parseSweepForm(form({ peaks: [{ frequency: '2.4495', unit: 'GHz', level: '−47.5' }] }));
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.value.startHz).toBe(2300e6);
      expect(r.value.rbwHz).toBe(100e3);
      expect(r.value.peaks).toEqual([{ frequencyHz: 2449.5e6, levelDbm: -47.5 }]);
    }
  });
  it('refuses a reversed span and a peak outside it, next to the right boxes', () => {
    const r = parseSweepForm(form({ start: '2600', stop: '2300' }));
    expect(!r.ok && r.errors.stop).toMatch(/above the start/);
    const p = parseSweepForm(form({ peaks: [{ frequency: '3', unit: 'GHz', level: '-40' }, { frequency: '2400', unit: 'MHz', level: 'loud' }] }));
    expect(!p.ok && p.errors['peaks.0.frequency']).toMatch(/outside the sweep span/);
    expect(!p.ok && p.errors['peaks.1.level']).toMatch(/not a number of dBm/);
    const rbw = parseSweepForm(form({ rbw: '0' }));
    expect(!rbw.ok && rbw.errors.rbw).toMatch(/above 0 Hz/);
  });
  it('checks a trace file and counts its rows', () => {
    expect(checkTraceCsv('Frequency (MHz),Level (dBm)\n2400,-80\n2450,-47.5\n2500,-82\n')).toEqual({ ok: true, rows: 3, minHz: 2400e6, maxHz: 2500e6, unit: 'MHz' });
    expect(checkTraceCsv('2.4e9;-80\n2.5e9;-81')).toMatchObject({ ok: true, rows: 2, unit: 'Hz' });
    expect(checkTraceCsv('freq,level\n2400,oops')).toMatchObject({ ok: false });
    expect(checkTraceCsv('')).toMatchObject({ ok: false });
  });
});
