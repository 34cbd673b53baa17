import { describe, expect, it } from 'vitest';
import { PROTON_MASS_KG } from './constants';
import { PhysicsInputError } from './errors';
import {
  BUILT_IN_SPECIES,
  BUILT_IN_SPECIES_IDS,
  customSpecies,
  H2_PLUS_MASS_KG,
  H_MINUS_MASS_KG,
  ionMassFromNeutralAtomKg,
  resolveSpecies,
  speciesChargeC,
  type SpeciesRef,
} from './species';

// Independent digits typed from the NIST CODATA 2018 listing (recalled where marked).
const NIST = {
  me: 9.1093837015e-31,
  mp: 1.67262192369e-27,
  u: 1.6605390666e-27,
  // recalled: hydrogen atom mass 1.007 825 032 241 u (AME 2016/2020 atomic mass of ¹H)
  hydrogenAtomU: 1.007825032241,
  c: 299792458,
  e: 1.602176634e-19,
};

describe('species', () => {
  it('lists the seven built-in species with their charge numbers', () => {
    expect(BUILT_IN_SPECIES_IDS).toEqual(['electron', 'proton', 'deuteron', 'alpha', 'helion', 'h-minus', 'h2-plus']);
    const charges = Object.fromEntries(BUILT_IN_SPECIES_IDS.map((id) => [id, BUILT_IN_SPECIES[id].chargeNumber]));
    expect(charges).toEqual({ electron: -1, proton: 1, deuteron: 1, alpha: 2, helion: 2, 'h-minus': -1, 'h2-plus': 1 });
  });

  it('deuteron/proton and alpha/proton mass ratios match NIST (recalled: 1.999 007 501 39, 3.972 599 690 09)', () => {
    expect(BUILT_IN_SPECIES.deuteron.massKg / BUILT_IN_SPECIES.proton.massKg).toBeCloseTo(1.99900750139, 9);
    expect(BUILT_IN_SPECIES.alpha.massKg / BUILT_IN_SPECIES.proton.massKg).toBeCloseTo(3.97259969009, 9);
  });

  it('H⁻ mass equals the ¹H atomic mass (recalled, atomic mass evaluation) plus one electron, less the 0.754 eV affinity', () => {
    const affinityKg = (0.754195 * NIST.e) / NIST.c ** 2;
    const expected = NIST.hydrogenAtomU * NIST.u + NIST.me - affinityKg;
    expect(Math.abs(H_MINUS_MASS_KG / expected - 1)).toBeLessThan(1e-9);
  });

  it('H₂⁺ mass is two protons plus one electron less ~16.25 eV of binding (13.598 eV + D₀ 2.651 eV, recalled)', () => {
    const naive = 2 * NIST.mp + NIST.me;
    const bindingEv = ((naive - H2_PLUS_MASS_KG) * NIST.c ** 2) / NIST.e;
    expect(bindingEv).toBeGreaterThan(16.2);
    expect(bindingEv).toBeLessThan(16.3);
    // the binding correction is below 1e-8 relative: far below any field measurement's uncertainty
    expect(Math.abs(H2_PLUS_MASS_KG / naive - 1)).toBeLessThan(1e-8);
  });

  it('a custom species takes its mass in u × CODATA m_u or directly in kg', () => {
    const argon = customSpecies({ id: 'ar-plus', name: 'argon ion', chargeNumber: 1, massU: 39.9623831237 - 5.48579909065e-4 });
    expect(argon.massKg).toBeCloseTo((39.9623831237 - 5.48579909065e-4) * 1.6605390666e-27, 35);
    const heavy = customSpecies({ id: 'x', name: 'x', chargeNumber: -2, massKg: 1e-25 });
    expect(heavy.massKg).toBe(1e-25);
    expect(speciesChargeC(heavy)).toBe(-2 * 1.602176634e-19);
  });

  it('forms an ion mass from a neutral atom: m_atom − z·mₑ + B/c²', () => {
    const hydrogenAtomKg = NIST.hydrogenAtomU * NIST.u;
    const proton = ionMassFromNeutralAtomKg(hydrogenAtomKg, 1, 13.598434);
    // recalled: ¹H atomic mass (AME) reproduces the CODATA proton mass to 1e-10 this way
    expect(Math.abs(proton / PROTON_MASS_KG - 1)).toBeLessThan(1e-9);
  });

  it.each<[string, unknown]>([
    ['unknown id', 'muon'],
    ['empty id', ''],
    ['prototype key', 'toString'],
    ['null', null],
    ['object without mass', { id: 'x', chargeNumber: 1 }],
  ])('rejects %s with UNKNOWN_SPECIES', (_name, ref) => {
    try {
      resolveSpecies(ref as SpeciesRef);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(PhysicsInputError);
      expect((error as PhysicsInputError).code).toBe('UNKNOWN_SPECIES');
    }
  });

  it.each([
    ['zero charge', { id: 'n', name: 'neutral', chargeNumber: 0, massU: 1 }],
    ['fractional charge', { id: 'q', name: 'q', chargeNumber: 0.5, massU: 1 }],
    ['both masses', { id: 'q', name: 'q', chargeNumber: 1, massU: 1, massKg: 1e-27 }],
    ['no mass', { id: 'q', name: 'q', chargeNumber: 1 }],
    ['NaN mass', { id: 'q', name: 'q', chargeNumber: 1, massU: NaN }],
    ['infinite mass', { id: 'q', name: 'q', chargeNumber: 1, massKg: Infinity }],
    ['negative mass', { id: 'q', name: 'q', chargeNumber: 1, massKg: -1e-27 }],
  ])('a custom species with %s raises the typed error', (_name, input) => {
    expect(() => customSpecies(input as never)).toThrow(PhysicsInputError);
  });

  it('a custom mass lighter than the electron is out of range', () => {
    expect(() => customSpecies({ id: 'q', name: 'q', chargeNumber: 1, massKg: 1e-32 })).toThrow(/between/);
  });

  it('ion-mass helper rejects bad inputs', () => {
    expect(() => ionMassFromNeutralAtomKg(NaN, 1)).toThrow(PhysicsInputError);
    expect(() => ionMassFromNeutralAtomKg(1e-26, 0)).toThrow(PhysicsInputError);
    expect(() => ionMassFromNeutralAtomKg(1e-26, 1, -1)).toThrow(PhysicsInputError);
  });
});
