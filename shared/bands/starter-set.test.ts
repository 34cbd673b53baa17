/**
 * The starter watch bands against the published tables named beside each row (transcribed here from the
 * sources, independently of starter-set.ts), and the MRI receive band against hand-computed values.
 */
import { describe, expect, it } from 'vitest';
import { mriReceiveBand, mriReceiveWatchBand, sameBand, STARTER_WATCH_BANDS } from './starter-set';

const byKey = new Map(STARTER_WATCH_BANDS.map((b) => [b.key, b]));
const MHz = 1e6;

describe('STARTER_WATCH_BANDS', () => {
  it.each([
    // ITU Radio Regulations (2020), Article 5, RR 5.340: 1400–1427 MHz, all emissions prohibited.
    ['ra-1400', 1400, 1427],
    // RR 5.340 (recalled list, marked so in the band's source): 2690–2700 MHz, 10.68–10.7 GHz, 23.6–24 GHz.
    ['ra-2690', 2690, 2700],
    ['ra-10680', 10680, 10700],
    ['ra-23600', 23600, 24000],
    // RR 5.150 and 47 CFR §18.301: 13.56 MHz ± 7 kHz, 27.12 MHz ± 163 kHz, 40.68 MHz ± 20 kHz, 2450 MHz ± 50 MHz, 5800 MHz ± 75 MHz.
    ['ism-13', 13.553, 13.567],
    ['ism-27', 26.957, 27.283],
    ['ism-40', 40.66, 40.7],
    ['ism-2400', 2400, 2500],
    ['ism-5800', 5725, 5875],
    // IS-GPS-200 carriers L1 1575.42 and L2 1227.60 MHz, IS-GPS-705 L5 1176.45 MHz; widths are the
    // C/A (1.023 Mchip/s) and L5 (10.23 Mchip/s) main lobes, recalled from memory.
    ['gnss-l1', 1575.42 - 1.023, 1575.42 + 1.023],
    ['gnss-l2', 1227.6 - 1.023, 1227.6 + 1.023],
    ['gnss-l5', 1176.45 - 10.23, 1176.45 + 10.23],
    // ICAO Annex 10: 108–117.975 MHz radionavigation and 117.975–137 MHz communications.
    ['aviation-vhf', 108, 137],
    // 47 CFR §95 MedRadio core band, 402–405 MHz.
    ['mics', 402, 405],
  ])('%s spans %f–%f MHz', (key, lowMHz, highMHz) => {
    const band = byKey.get(key)!;
    expect(band).toBeDefined();
    expect(band.lowerHz / MHz).toBeCloseTo(lowMHz, 6);
    expect(band.upperHz / MHz).toBeCloseTo(highMHz, 6);
  });

  it('the ISM bands are centred on the RR 5.150 centre frequencies', () => {
    // RR 5.150: 13.560, 27.120, 40.680 MHz, 2.450 GHz, 5.800 GHz.
    for (const [key, centreMHz] of [['ism-13', 13.56], ['ism-27', 27.12], ['ism-40', 40.68], ['ism-2400', 2450], ['ism-5800', 5800]] as const) {
      const band = byKey.get(key)!;
      expect((band.lowerHz + band.upperHz) / 2 / MHz).toBeCloseTo(centreMHz, 6);
    }
  });

  it('every band names a source, and every recalled value says so', () => {
    for (const band of STARTER_WATCH_BANDS) {
      expect(band.source.length).toBeGreaterThan(10);
      expect(band.lowerHz).toBeLessThan(band.upperHz);
    }
    // The rows the handbook marks as recalled.
    for (const key of ['ra-2690', 'ra-10680', 'ra-23600', 'gnss-l1', 'gnss-l2', 'gnss-l5']) expect(byKey.get(key)!.source).toMatch(/recalled from memory/);
    // ITU-R RA.769-2's spectral-line threshold at 1420 MHz, −239 dB(W/(m²·Hz)), recalled.
    expect(byKey.get('ra-1400')!.thresholdDbWPerM2Hz).toBe(-239);
    expect(byKey.get('ra-1400')!.source).toMatch(/RA\.769-2 \(recalled from memory\)/);
  });

  it('keys are unique', () => {
    expect(byKey.size).toBe(STARTER_WATCH_BANDS.length);
  });
});

describe('mriReceiveBand', () => {
  // CODATA 2018: γₚ/2π = 42.577 478 518 MHz/T, so 1.5 T → 63.866 217 777 MHz and 3 T → 127.732 435 554 MHz
  // (hand multiplication); the usual quoted figures are "64 MHz" and "128 MHz" scanners (common practice).
  it.each([
    [1.5, 63.866217777],
    [3, 127.732435554],
    [7, 298.042349626],
  ])('%f T receives at %f MHz', (fieldT, centreMHz) => {
    const band = mriReceiveBand(fieldT);
    expect(band.centreHz / MHz).toBeCloseTo(centreMHz, 6);
    expect(band.upperHz - band.lowerHz).toBeCloseTo(1e6, 3);
  });

  it('is labelled as precession, not as a cyclotron line', () => {
    const band = mriReceiveWatchBand({ name: 'MR 1', nominalFieldT: 3 });
    expect(band.name).toBe('MR 1 receive band (127.732 MHz)');
    expect(band.reason).toMatch(/Precession, not a cyclotron line/);
    expect(band.source).toMatch(/recalled from memory/);
  });

  it('refuses a field that is not a positive number', () => {
    expect(() => mriReceiveBand(0)).toThrow();
    expect(() => mriReceiveBand(Number.NaN)).toThrow();
    expect(() => mriReceiveBand(3, -1)).toThrow(RangeError);
  });
});

describe('sameBand', () => {
  const gps = { name: 'GPS L1', lowerHz: 1574.397e6, upperHz: 1576.443e6 };
  it('matches by name whatever the case and spacing', () => {
    expect(sameBand(gps, { name: '  gps   l1 ', lowerHz: 1, upperHz: 2 })).toBe(true);
  });
  it('matches by edges within 1 kHz (or a millionth of the upper edge)', () => {
    // 1e-6 × 1576.443 MHz = 1.58 kHz: a 1.5 kHz shift is the same band, a 2 kHz shift is not.
    expect(sameBand(gps, { name: 'Timing receiver', lowerHz: gps.lowerHz + 1.5e3, upperHz: gps.upperHz - 1.5e3 })).toBe(true);
    expect(sameBand(gps, { name: 'Timing receiver', lowerHz: gps.lowerHz + 2e3, upperHz: gps.upperHz })).toBe(false);
    // Below 1 GHz the floor of 1 kHz rules.
    expect(sameBand({ name: 'a', lowerHz: 13.553e6, upperHz: 13.567e6 }, { name: 'b', lowerHz: 13.5539e6, upperHz: 13.567e6 })).toBe(true);
    expect(sameBand({ name: 'a', lowerHz: 13.553e6, upperHz: 13.567e6 }, { name: 'b', lowerHz: 13.5541e6, upperHz: 13.567e6 })).toBe(false);
  });
});
