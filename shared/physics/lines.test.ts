import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PhysicsInputError } from './errors';
import {
  angularCyclotronFrequencyRadPerS,
  cyclotronFrequenciesHz,
  cyclotronFrequencyHz,
  cyclotronHzPerTesla,
  harmonicFrequenciesHz,
  lineBandHz,
  MAX_HARMONIC,
  protonPrecessionFrequencyHz,
  stationLineBandsHz,
} from './lines';
import { BUILT_IN_SPECIES_IDS, type BuiltInSpeciesId } from './species';

const E = 1.602176634e-19; // CODATA 2018 (exact), typed from the NIST listing
const MP = 1.67262192369e-27; // CODATA 2018
const KEV = 1e3 * E;
const MEV = 1e6 * E;

describe('cyclotron frequency per tesla (CODATA 2018, ../shared/REFERENCES.md)', () => {
  it('electron ≈ 27.99 GHz/T', () => {
    expect(cyclotronFrequencyHz('electron', 1) / 1e9).toBeCloseTo(27.99, 2);
    expect(cyclotronHzPerTesla('electron')).toBeCloseTo(cyclotronFrequencyHz('electron', 1), 0);
  });

  it('proton ≈ 15.245 MHz/T', () => {
    expect(cyclotronFrequencyHz('proton', 1) / 1e6).toBeCloseTo(15.245, 3);
  });

  it('ω and f differ by exactly 2π', () => {
    expect(angularCyclotronFrequencyRadPerS('electron', 0.01) / cyclotronFrequencyHz('electron', 0.01)).toBeCloseTo(2 * Math.PI, 12);
  });

  // Traps: NIST's gyromagnetic ratios are spin resonance and NMR precession, not cyclotron lines.
  it('is NOT the electron spin resonance 28.025 GHz/T (NIST γₑ/2π); the ratio is g/2 = 1.001 159 652 (recalled)', () => {
    const cyclotron = cyclotronFrequencyHz('electron', 1);
    expect(Math.abs(cyclotron - 28.025e9)).toBeGreaterThan(30e6);
    expect(28.0249514242e9 / cyclotron).toBeCloseTo(1.00115965218, 9);
  });

  it('is NOT the proton NMR precession 42.577 MHz/T (NIST γₚ/2π); the ratio is μₚ/μ_N = 2.792 847 344 63 (recalled)', () => {
    const cyclotron = cyclotronFrequencyHz('proton', 1);
    expect(Math.abs(cyclotron - 42.577e6)).toBeGreaterThan(27e6);
    expect(protonPrecessionFrequencyHz(1) / cyclotron).toBeCloseTo(2.79284734463, 9);
  });

  it('a 3 T MR scanner receives near 127.7 MHz (precession, common practice), far from the 45.7 MHz proton cyclotron line', () => {
    expect(protonPrecessionFrequencyHz(3) / 1e6).toBeCloseTo(127.73, 2);
    expect(cyclotronFrequencyHz('proton', 3) / 1e6).toBeCloseTo(45.74, 2);
  });
});

// NRL Plasma Formulary (J. D. Huba, 2019 edition): f_ce = 2.80e6·B Hz, f_ci = 1.52e3·Z·μ⁻¹·B Hz, B in gauss,
// μ = m_i/m_p (proton mass, not u).
describe('gyrofrequency against the NRL Plasma Formulary (2019)', () => {
  const fieldsGauss = [1e-2, 1, 100, 1e4, 1e5]; // 1 µT .. 10 T
  it('electron: 2.80e6 Hz per gauss to 3 significant figures', () => {
    for (const bGauss of fieldsGauss) {
      expect((cyclotronFrequencyHz('electron', bGauss * 1e-4) / bGauss).toPrecision(3)).toBe('2.80e+6');
    }
  });

  it.each<[BuiltInSpeciesId, number, number]>([
    ['proton', 1, MP],
    ['deuteron', 1, 3.3435837724e-27],
    ['alpha', 2, 6.6446573357e-27],
    ['helion', 2, 5.0064127796e-27], // recalled helion mass
    ['h2-plus', 1, 2 * MP + 9.1093837015e-31],
  ])('%s: 1.52e3·Z·μ⁻¹ Hz per gauss to 3 significant figures', (species, z, massKg) => {
    const mu = massKg / MP;
    for (const bGauss of fieldsGauss) {
      const coefficient = (cyclotronFrequencyHz(species, bGauss * 1e-4) * mu) / (z * bGauss);
      expect(coefficient.toPrecision(3)).toBe('1.52e+3');
    }
  });
});

describe('relativistic shift (γ = 1 + E/mc²)', () => {
  it('an electron at 1 keV is already 0.2 % low and at 10 keV about 2 % (REFERENCES.md)', () => {
    const cold = cyclotronFrequencyHz('electron', 0.05);
    const shift1 = 1 - cyclotronFrequencyHz('electron', 0.05, 1 * KEV) / cold;
    const shift10 = 1 - cyclotronFrequencyHz('electron', 0.05, 10 * KEV) / cold;
    expect(shift1).toBeGreaterThan(0.0019);
    expect(shift1).toBeLessThan(0.002);
    expect(shift10).toBeGreaterThan(0.018);
    expect(shift10).toBeLessThan(0.02);
  });

  it('a 10 MeV proton line is 1.05 % low: f/f₀ = 1/(1 + 10/938.272) (proton rest energy, NIST, recalled)', () => {
    const ratio = cyclotronFrequencyHz('proton', 1.5, 10 * MEV) / cyclotronFrequencyHz('proton', 1.5);
    expect(ratio).toBeCloseTo(1 / (1 + 10 / 938.27208816), 10);
    expect((1 - ratio) * 100).toBeCloseTo(1.05, 2);
  });
});

describe('properties (fast-check)', () => {
  const field = fc.double({ min: 1e-9, max: 20, noNaN: true });
  const species = fc.constantFrom(...BUILT_IN_SPECIES_IDS);
  it('is linear in B: f(k·B) = k·f(B)', () => {
    fc.assert(
      fc.property(species, field, fc.double({ min: 1e-3, max: 1e3, noNaN: true }), (s, b, k) => {
        fc.pre(b * k <= 1e3);
        const lhs = cyclotronFrequencyHz(s, b * k);
        const rhs = k * cyclotronFrequencyHz(s, b);
        return Math.abs(lhs / rhs - 1) < 1e-12;
      }),
    );
  });

  it('harmonics are exact multiples n·f₁', () => {
    fc.assert(
      fc.property(species, field, fc.integer({ min: 1, max: 20 }), fc.double({ min: 0, max: 1e-13, noNaN: true }), (s, b, count, energy) => {
        const lines = harmonicFrequenciesHz(s, b, count, energy);
        const f1 = cyclotronFrequencyHz(s, b, energy);
        return lines.length === count && lines.every((f, i) => f === (i + 1) * f1);
      }),
    );
  });

  it('a band contains the line at every field inside the interval, and widening only grows it', () => {
    fc.assert(
      fc.property(species, field, field, fc.double({ min: 0, max: 0.5, noNaN: true }), fc.integer({ min: 1, max: 5 }), fc.double({ min: 0, max: 1, noNaN: true }), (s, b1, b2, u, n, t) => {
        const bMin = Math.min(b1, b2);
        const bMax = Math.max(b1, b2);
        const band = lineBandHz({ species: s, harmonic: n, fieldMinTesla: bMin, fieldMaxTesla: bMax, relativeUncertainty: u });
        const narrow = lineBandHz({ species: s, harmonic: n, fieldMinTesla: bMin, fieldMaxTesla: bMax });
        const inside = n * cyclotronFrequencyHz(s, bMin + t * (bMax - bMin));
        const tol = 1e-12 * band.highHz;
        return band.lowHz <= narrow.lowHz && band.highHz >= narrow.highHz && inside >= narrow.lowHz - tol && inside <= narrow.highHz + tol;
      }),
    );
  });
});

describe('bands and array forms', () => {
  it('an instrument’s ±3 % widens [Bmin, Bmax] to [0.97·Bmin, 1.03·Bmax]', () => {
    const band = lineBandHz({ species: 'electron', harmonic: 2, fieldMinTesla: 0.01, fieldMaxTesla: 0.02, relativeUncertainty: 0.03 });
    expect(band.lowHz).toBeCloseTo(2 * cyclotronFrequencyHz('electron', 0.0097), 0);
    expect(band.highHz).toBeCloseTo(2 * cyclotronFrequencyHz('electron', 0.0206), 0);
  });

  it('an energy interval lowers the band’s low edge through γ', () => {
    const band = lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: 0.1, fieldMaxTesla: 0.1, kineticEnergyMinJ: 0, kineticEnergyMaxJ: 10 * KEV });
    expect(band.highHz).toBeCloseTo(cyclotronFrequencyHz('electron', 0.1), 0);
    expect(band.lowHz).toBeCloseTo(cyclotronFrequencyHz('electron', 0.1, 10 * KEV), 0);
  });

  it('the array form equals the scalar form element by element', () => {
    const fields = Float64Array.from([1e-6, 3e-4, 0.5e-3, 0.1, 3]);
    const out = cyclotronFrequenciesHz('deuteron', fields);
    fields.forEach((b, i) => expect(out[i]).toBe(cyclotronHzPerTesla('deuteron') * b));
    const bands = stationLineBandsHz('electron', fields, 3, 0.02);
    fields.forEach((b, i) => {
      expect(bands.lowHz[i]).toBeCloseTo(3 * cyclotronFrequencyHz('electron', b) * 0.98, -1);
      expect(bands.highHz[i]).toBeCloseTo(3 * cyclotronFrequencyHz('electron', b) * 1.02, -1);
    });
    const perStation = stationLineBandsHz('electron', fields, 1, Float64Array.from([0, 0.01, 0.02, 0.03, 0.04]));
    expect(perStation.highHz[4]).toBeCloseTo(cyclotronFrequencyHz('electron', 3) * 1.04, -2);
  });
});

describe('input errors', () => {
  it.each([0, -1e-3, NaN, Infinity, -Infinity])('field %s raises PhysicsInputError everywhere', (bad) => {
    expect(() => cyclotronFrequencyHz('electron', bad)).toThrow(PhysicsInputError);
    expect(() => angularCyclotronFrequencyRadPerS('electron', bad)).toThrow(PhysicsInputError);
    expect(() => harmonicFrequenciesHz('electron', bad, 3)).toThrow(PhysicsInputError);
    expect(() => protonPrecessionFrequencyHz(bad)).toThrow(PhysicsInputError);
    expect(() => lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: bad, fieldMaxTesla: 1 })).toThrow(PhysicsInputError);
    expect(() => lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: 1e-3, fieldMaxTesla: bad })).toThrow(PhysicsInputError);
    expect(() => cyclotronFrequenciesHz('electron', Float64Array.from([1e-3, bad]))).toThrow(/fieldsTesla\[1\]/);
    expect(() => stationLineBandsHz('electron', Float64Array.from([bad]), 1, 0)).toThrow(PhysicsInputError);
  });

  it.each([-1, NaN, Infinity, 2e12 * E])('kinetic energy %s raises PhysicsInputError', (bad) => {
    expect(() => cyclotronFrequencyHz('electron', 1, bad)).toThrow(PhysicsInputError);
    expect(() => cyclotronHzPerTesla('electron', bad)).toThrow(PhysicsInputError);
    expect(() => lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: 1, fieldMaxTesla: 1, kineticEnergyMaxJ: bad })).toThrow(PhysicsInputError);
  });

  it('bad harmonics, uncertainties, inverted intervals and unknown species are refused', () => {
    expect(() => harmonicFrequenciesHz('electron', 1, 0)).toThrow(PhysicsInputError);
    expect(() => harmonicFrequenciesHz('electron', 1, 2.5)).toThrow(PhysicsInputError);
    expect(() => harmonicFrequenciesHz('electron', 1, MAX_HARMONIC + 1)).toThrow(PhysicsInputError);
    expect(() => lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: 1, fieldMaxTesla: 1, relativeUncertainty: 1 })).toThrow(PhysicsInputError);
    expect(() => lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: 1, fieldMaxTesla: 1, relativeUncertainty: -0.1 })).toThrow(PhysicsInputError);
    expect(() => lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: 2, fieldMaxTesla: 1 })).toThrow(PhysicsInputError);
    expect(() => lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: 1, fieldMaxTesla: 1, kineticEnergyMinJ: 2, kineticEnergyMaxJ: 1 })).toThrow(PhysicsInputError);
    expect(() => stationLineBandsHz('electron', Float64Array.from([1]), 1, Float64Array.from([0.1, 0.2]))).toThrow(PhysicsInputError);
    expect(() => cyclotronFrequenciesHz('electron', Float64Array.from([1]), 0, new Float64Array(2))).toThrow(PhysicsInputError);
    expect(() => cyclotronFrequencyHz('positron' as never, 1)).toThrow(expect.objectContaining({ code: 'UNKNOWN_SPECIES' }));
  });
});
