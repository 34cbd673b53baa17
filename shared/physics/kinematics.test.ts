import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PhysicsInputError } from './errors';
import {
  betaFromKineticEnergy,
  gyroradiusFromSpeedM,
  gyroradiusM,
  kineticEnergyFromSpeedJ,
  lorentzFactor,
  magneticRigidityTeslaMetre,
  MAX_KINETIC_ENERGY_J,
  momentumFromKineticEnergyKgMPerS,
  speedFromKineticEnergyMPerS,
} from './kinematics';
import type { BuiltInSpeciesId } from './species';

// Independent inputs typed from the NIST CODATA 2018 listing, not imported from our constants.
const E = 1.602176634e-19;
const C = 299792458;
const ME = 9.1093837015e-31;
const MP = 1.67262192369e-27;
const MEV = 1e6 * E;

describe('kinematics', () => {
  it('a 10 MeV proton moves at ≈ 4.4e7 m/s (common practice check; that figure is the classical √(2E/m))', () => {
    const v = speedFromKineticEnergyMPerS('proton', 10 * MEV);
    const classical = Math.sqrt((2 * 10 * MEV) / MP);
    expect(classical).toBeCloseTo(4.38e7, -5); // the quoted ≈4.4e7
    expect(v).toBeGreaterThan(4.3e7);
    expect(v).toBeLessThan(4.4e7);
    // relativistic: β = √(1 − 1/γ²), γ = 1 + 10/938.272 088 16 (proton rest energy, NIST, recalled)
    const gamma = 1 + 10 / 938.27208816;
    expect(v / C).toBeCloseTo(Math.sqrt(1 - 1 / gamma ** 2), 10);
  });

  it('γ = 1 + E/mc² for an electron at 511 keV is ≈ 2 (rest energy 0.510 998 95 MeV, NIST)', () => {
    expect(lorentzFactor('electron', 0.51099895 * MEV)).toBeCloseTo(2, 8);
  });

  it('β keeps its digits at 1 meV: matches the low-energy series β = √(2ε)(1 − 3ε/4), ε = E/mc², to 1e-12', () => {
    const energy = 1e-3 * E;
    const epsilon = energy / (ME * C * C);
    const series = Math.sqrt(2 * epsilon) * (1 - 0.75 * epsilon);
    expect(Math.abs(betaFromKineticEnergy('electron', energy) / series - 1)).toBeLessThan(1e-12);
  });

  it('PDG rigidity rule: Bρ[T·m] = 3.3356·p[GeV/c]/z (Review of Particle Physics)', () => {
    for (const [species, z, restMev] of [
      ['proton', 1, 938.27208816], // NIST rest energy (recalled)
      ['electron', 1, 0.51099895],
      ['alpha', 2, 3727.3794066], // recalled: alpha rest energy, NIST
    ] as const) {
      for (const kineticMev of [1, 18, 250, 7000]) {
        const pGeV = Math.sqrt(kineticMev ** 2 + 2 * kineticMev * restMev) / 1000;
        const rigidity = magneticRigidityTeslaMetre(species, kineticMev * MEV);
        expect(Math.abs(rigidity / ((3.3356 * pGeV) / z) - 1)).toBeLessThan(2e-5);
      }
    }
  });

  it('p = 0.3·z·B·R (PDG): a 1 GeV/c proton in 1 T bends on a 3.34 m radius', () => {
    const restMev = 938.27208816;
    const kineticMev = Math.sqrt(1000 ** 2 + restMev ** 2) - restMev;
    expect(gyroradiusM('proton', 1, kineticMev * MEV)).toBeCloseTo(1 / 0.29979, 3);
  });

  it('momentum and kinetic energy invert each other (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e9, noNaN: true }), (energyEv) => {
        const v = speedFromKineticEnergyMPerS('proton', energyEv * E);
        const back = kineticEnergyFromSpeedJ('proton', v) / E;
        return Math.abs(back / energyEv - 1) < 1e-6;
      }),
    );
    const p = momentumFromKineticEnergyKgMPerS('electron', 10e3 * E);
    const gamma = 1 + 10e3 / 510998.95;
    expect(Math.abs(p / (gamma * ME * betaFromKineticEnergy('electron', 10e3 * E) * C) - 1)).toBeLessThan(1e-12);
  });

  it('the gyroradius scales as sin(pitch angle) and 1/B', () => {
    const r90 = gyroradiusM('proton', 0.1, 1e3 * E);
    expect(gyroradiusM('proton', 0.1, 1e3 * E, Math.PI / 6)).toBeCloseTo(r90 / 2, 12);
    expect(gyroradiusM('proton', 0.2, 1e3 * E)).toBeCloseTo(r90 / 2, 12);
  });
});

// NRL Plasma Formulary (J. D. Huba, Naval Research Laboratory, 2019 edition), "Fundamental plasma
// parameters": r_e = 2.38·T_e^½·B⁻¹ cm, r_i = 1.02e2·μ^½·Z⁻¹·T_i^½·B⁻¹ cm, with B in gauss, T in eV,
// μ = m_i/m_p, and the thermal speed v = (kT/m)^½.
describe('gyroradius against the NRL Plasma Formulary (2019)', () => {
  const fields = [1, 10, 100, 1e3, 1e4]; // gauss: 0.1 mT .. 1 T
  const cases: Array<[BuiltInSpeciesId, number, number, number, number[]]> = [
    // species, mass (NIST digits), Z, NRL coefficient, temperatures in eV
    ['electron', ME, 1, 2.38, [0.1, 1, 10, 100]],
    ['proton', MP, 1, 1.02e2, [0.1, 1, 100, 1e4]],
    ['deuteron', 3.3435837724e-27, 1, 1.02e2, [1, 100, 1e4]],
    ['alpha', 6.6446573357e-27, 2, 1.02e2, [1, 100, 1e4]],
  ];
  it.each(cases)('%s agrees to 3 significant figures across five decades of field', (species, massKg, z, coefficient, temperatures) => {
    const mu = species === 'electron' ? 1 : massKg / MP;
    for (const bGauss of fields) {
      for (const tEv of temperatures) {
        const thermalSpeed = Math.sqrt((tEv * E) / massKg);
        const radiusCm = gyroradiusFromSpeedM(species, bGauss * 1e-4, thermalSpeed) * 100;
        const nrlFactor = species === 'electron' ? Math.sqrt(tEv) / bGauss : (Math.sqrt(mu) * Math.sqrt(tEv)) / (z * bGauss);
        expect((radiusCm / nrlFactor).toPrecision(3)).toBe(coefficient.toPrecision(3));
      }
    }
  });

  it('the most probable speed (2kT/m)^½ gives radii √2 larger and does NOT match the formulary (convention trap)', () => {
    const tEv = 10;
    const bGauss = 100;
    const radiusCm = gyroradiusFromSpeedM('electron', bGauss * 1e-4, Math.sqrt((2 * tEv * E) / ME)) * 100;
    const coefficient = radiusCm / (Math.sqrt(tEv) / bGauss);
    expect(coefficient.toPrecision(3)).not.toBe('2.38');
    expect(coefficient / 2.38).toBeCloseTo(Math.SQRT2, 2);
  });
});

describe('kinematics input errors', () => {
  const bad = [NaN, Infinity, -Infinity, -1];
  it.each(bad)('kinetic energy %s raises PhysicsInputError', (energy) => {
    for (const fn of [lorentzFactor, betaFromKineticEnergy, speedFromKineticEnergyMPerS, momentumFromKineticEnergyKgMPerS, magneticRigidityTeslaMetre]) {
      expect(() => fn('proton', energy)).toThrow(PhysicsInputError);
    }
    expect(() => gyroradiusM('proton', 1, energy)).toThrow(PhysicsInputError);
  });

  it('an energy above 1 TeV is out of range', () => {
    expect(() => lorentzFactor('proton', MAX_KINETIC_ENERGY_J * 1.01)).toThrow(/between/);
  });

  it.each([0, -0.1, NaN, Infinity, -Infinity])('field %s raises PhysicsInputError for the gyroradius', (field) => {
    expect(() => gyroradiusM('electron', field, E)).toThrow(PhysicsInputError);
    expect(() => gyroradiusFromSpeedM('electron', field, 1e5)).toThrow(PhysicsInputError);
  });

  it('speeds at or above c, and bad pitch angles, are refused', () => {
    expect(() => kineticEnergyFromSpeedJ('electron', C)).toThrow(PhysicsInputError);
    expect(() => gyroradiusFromSpeedM('electron', 1, C)).toThrow(PhysicsInputError);
    expect(() => gyroradiusFromSpeedM('electron', 1, 0.8 * C, 0.7 * C)).toThrow(PhysicsInputError);
    expect(() => gyroradiusM('electron', 1, E, 4)).toThrow(PhysicsInputError);
    expect(() => gyroradiusM('electron', 1, E, NaN)).toThrow(PhysicsInputError);
  });

  it('an unknown species raises UNKNOWN_SPECIES', () => {
    expect(() => lorentzFactor('muon' as never, E)).toThrow(expect.objectContaining({ code: 'UNKNOWN_SPECIES' }));
  });
});
