/**
 * Charged species whose cyclotron lines Fringewalk predicts.
 *
 * Bare particles take their CODATA 2018 masses directly (constants.ts). Compound ions are formed from
 * CODATA masses and the electron mass, minus the total electronic binding energy divided by c²:
 *
 *   H⁻  = mₚ + 2mₑ − (E_i(H) + E_ea(H))/c²      E_i(H) = 13.598 434 eV, E_ea(H) = 0.754 195 eV
 *   H₂⁺ = 2mₚ + mₑ − (E_i(H) + D₀(H₂⁺))/c²      D₀(H₂⁺) = 2.650 72 eV (21 379.4 cm⁻¹)
 *
 * The binding energies are RECALLED (H ionisation energy from the NIST Atomic Spectra Database; H
 * electron affinity from Lykke, Murray & Lineberger, Phys. Rev. A 43, 6104 (1991); H₂⁺ dissociation
 * energy from the molecular-hydrogen-ion literature). They are ~1e-8 of the mass, so even a 1 % error
 * in them moves a line by ~1e-10 relative. Neglecting them entirely would shift H⁻ by 1.5e-8 and H₂⁺ by
 * 8.7e-9 relative. The resulting masses are good to about 3e-10 relative (the CODATA uncertainty),
 * far below any gaussmeter's (~1e-2) — the cyclotron line is limited by the field, never by the mass.
 *
 * H₂⁺ is taken in its vibrational ground state; a vibrationally excited ion is lighter by < 3 eV/c²,
 * i.e. < 2e-9 relative, which does not matter here.
 */

import { z } from 'zod';
import {
  ALPHA_MASS_KG,
  ATOMIC_MASS_UNIT_KG,
  DEUTERON_MASS_KG,
  ELECTRON_MASS_KG,
  ELECTRON_VOLT_J,
  ELEMENTARY_CHARGE_C,
  HELION_MASS_KG,
  PROTON_MASS_KG,
  SPEED_OF_LIGHT_M_PER_S,
} from './constants';
import { PhysicsInputError, requireInteger, requireInRange, requireNonNegative, requirePositive } from './errors';

/** A charged species: charge number z (charge = z·e) and rest mass. */
export interface Species {
  readonly id: string;
  readonly name: string;
  /** Display symbol, e.g. "e⁻", "p", "H₂⁺". */
  readonly symbol: string;
  /** Charge in units of the elementary charge (signed; electron −1). Never zero. */
  readonly chargeNumber: number;
  readonly massKg: number;
  /** Where the mass comes from. */
  readonly massSource: string;
}

/** Ids of the built-in species. */
export type BuiltInSpeciesId = 'electron' | 'proton' | 'deuteron' | 'alpha' | 'helion' | 'h-minus' | 'h2-plus';

/** A species by built-in id, or a species object (e.g. from {@link customSpecies}). */
export type SpeciesRef = BuiltInSpeciesId | Species;

/** Recalled binding energies used for the compound ions (see module docblock). */
export const HYDROGEN_IONISATION_ENERGY_EV = 13.598_434;
export const HYDROGEN_ELECTRON_AFFINITY_EV = 0.754_195;
export const H2_PLUS_DISSOCIATION_ENERGY_EV = 2.650_72;

function bindingMassKg(bindingEnergyEv: number): number {
  return (bindingEnergyEv * ELECTRON_VOLT_J) / (SPEED_OF_LIGHT_M_PER_S * SPEED_OF_LIGHT_M_PER_S);
}

/** Mass of H⁻: mₚ + 2mₑ − (E_i(H) + E_ea(H))/c² (see module docblock). */
export const H_MINUS_MASS_KG =
  PROTON_MASS_KG + 2 * ELECTRON_MASS_KG - bindingMassKg(HYDROGEN_IONISATION_ENERGY_EV + HYDROGEN_ELECTRON_AFFINITY_EV);

/** Mass of H₂⁺: 2mₚ + mₑ − (E_i(H) + D₀(H₂⁺))/c² (see module docblock). */
export const H2_PLUS_MASS_KG =
  2 * PROTON_MASS_KG + ELECTRON_MASS_KG - bindingMassKg(HYDROGEN_IONISATION_ENERGY_EV + H2_PLUS_DISSOCIATION_ENERGY_EV);

const CODATA = 'CODATA 2018';

/** The built-in species, keyed by id. */
export const BUILT_IN_SPECIES: Readonly<Record<BuiltInSpeciesId, Species>> = Object.freeze({
  electron: { id: 'electron', name: 'electron', symbol: 'e⁻', chargeNumber: -1, massKg: ELECTRON_MASS_KG, massSource: CODATA },
  proton: { id: 'proton', name: 'proton', symbol: 'p', chargeNumber: 1, massKg: PROTON_MASS_KG, massSource: CODATA },
  deuteron: { id: 'deuteron', name: 'deuteron', symbol: 'd', chargeNumber: 1, massKg: DEUTERON_MASS_KG, massSource: CODATA },
  alpha: { id: 'alpha', name: 'alpha particle (⁴He²⁺)', symbol: 'α', chargeNumber: 2, massKg: ALPHA_MASS_KG, massSource: CODATA },
  helion: { id: 'helion', name: 'helion (³He²⁺)', symbol: 'h', chargeNumber: 2, massKg: HELION_MASS_KG, massSource: CODATA },
  'h-minus': {
    id: 'h-minus',
    name: 'hydrogen anion',
    symbol: 'H⁻',
    chargeNumber: -1,
    massKg: H_MINUS_MASS_KG,
    massSource: `${CODATA} mₚ + 2mₑ − (13.598 434 + 0.754 195) eV/c² (binding energies recalled)`,
  },
  'h2-plus': {
    id: 'h2-plus',
    name: 'molecular hydrogen ion',
    symbol: 'H₂⁺',
    chargeNumber: 1,
    massKg: H2_PLUS_MASS_KG,
    massSource: `${CODATA} 2mₚ + mₑ − (13.598 434 + 2.650 72) eV/c² (binding energies recalled)`,
  },
});

/** The built-in species ids, in display order. */
export const BUILT_IN_SPECIES_IDS: readonly BuiltInSpeciesId[] = Object.freeze(
  Object.keys(BUILT_IN_SPECIES) as BuiltInSpeciesId[],
);

/** Plausible mass range for any species: from the electron to a ~600 000 u cluster ion. */
const MIN_MASS_KG = ELECTRON_MASS_KG * (1 - 1e-9);
const MAX_MASS_KG = 1e-21;
const MAX_CHARGE_NUMBER = 100;

/** Input for {@link customSpecies}: charge number and a mass in u or kg (exactly one). */
export const CustomSpeciesInputSchema = z
  .object({
    id: z.string().trim().min(1).max(64),
    name: z.string().trim().min(1).max(120),
    symbol: z.string().trim().min(1).max(24).optional(),
    chargeNumber: z.number().int().min(-MAX_CHARGE_NUMBER).max(MAX_CHARGE_NUMBER).refine((v) => v !== 0, {
      message: 'A species must carry charge: the charge number cannot be zero.',
    }),
    massU: z.number().positive().finite().optional(),
    massKg: z.number().positive().finite().optional(),
  })
  .refine((v) => (v.massU === undefined) !== (v.massKg === undefined), {
    message: 'Give the mass either in u or in kg (exactly one of them).',
  });

export type CustomSpeciesInput = z.infer<typeof CustomSpeciesInputSchema>;

/**
 * A custom species from a charge number and a mass in u (× CODATA 2018 m_u) or kg.
 * Throws UNKNOWN_SPECIES when the input is malformed, OUT_OF_RANGE for an implausible mass.
 */
export function customSpecies(input: CustomSpeciesInput): Species {
  const parsed = CustomSpeciesInputSchema.safeParse(input);
  if (!parsed.success) {
    const first = parsed.error.issues[0];
    throw new PhysicsInputError('UNKNOWN_SPECIES', `Custom species is not valid: ${first?.message ?? 'invalid input'}.`, {
      field: first?.path.join('.') || 'species',
      value: input,
    });
  }
  const v = parsed.data;
  const massKg = v.massKg ?? (v.massU as number) * ATOMIC_MASS_UNIT_KG;
  const species: Species = {
    id: v.id,
    name: v.name,
    symbol: v.symbol ?? v.name,
    chargeNumber: v.chargeNumber,
    massKg,
    massSource: v.massKg !== undefined ? 'custom (kg)' : `custom (${v.massU} u × ${CODATA} m_u)`,
  };
  return validateSpecies(species);
}

/**
 * Mass of a positive ion of charge z made from a neutral atom (as atomic-mass tables give it):
 * m_ion = m_atom − z·mₑ + B/c², where B is the sum of the first z ionisation energies in eV.
 * Source: the definition of atomic mass (atom = nucleus + electrons − binding), e.g. the Atomic Mass
 * Evaluation's conventions. B/c² is ~1e-8 relative for light ions and may be left 0 at that precision.
 */
export function ionMassFromNeutralAtomKg(atomMassKg: number, chargeNumber: number, ionisationEnergySumEv = 0): number {
  requirePositive(atomMassKg, 'atomMassKg');
  requireInteger(chargeNumber, 'chargeNumber', 1, MAX_CHARGE_NUMBER);
  requireNonNegative(ionisationEnergySumEv, 'ionisationEnergySumEv');
  const massKg = atomMassKg - chargeNumber * ELECTRON_MASS_KG + bindingMassKg(ionisationEnergySumEv);
  return requirePositive(massKg, 'ionMassKg');
}

function validateSpecies(species: Species): Species {
  requireInteger(species.chargeNumber, 'chargeNumber', -MAX_CHARGE_NUMBER, MAX_CHARGE_NUMBER);
  if (species.chargeNumber === 0) {
    throw new PhysicsInputError('UNKNOWN_SPECIES', 'A species must carry charge: the charge number cannot be zero.', {
      field: 'chargeNumber',
      value: 0,
    });
  }
  requirePositive(species.massKg, 'massKg');
  requireInRange(species.massKg, 'massKg', MIN_MASS_KG, MAX_MASS_KG, 'kg');
  return species;
}

/**
 * Resolves a species id or object to a validated {@link Species}.
 * Throws UNKNOWN_SPECIES for an unknown id or a malformed object.
 */
export function resolveSpecies(ref: SpeciesRef): Species {
  if (typeof ref === 'string') {
    const found = Object.prototype.hasOwnProperty.call(BUILT_IN_SPECIES, ref)
      ? BUILT_IN_SPECIES[ref as BuiltInSpeciesId]
      : undefined;
    if (!found) {
      throw new PhysicsInputError(
        'UNKNOWN_SPECIES',
        `Unknown species "${String(ref)}". Known: ${BUILT_IN_SPECIES_IDS.join(', ')}, or define a custom species.`,
        { field: 'species', value: ref },
      );
    }
    return found;
  }
  if (ref === null || typeof ref !== 'object' || typeof ref.chargeNumber !== 'number' || typeof ref.massKg !== 'number') {
    throw new PhysicsInputError('UNKNOWN_SPECIES', 'Species must be a known id or an object with charge number and mass.', {
      field: 'species',
      value: ref,
    });
  }
  return validateSpecies(ref);
}

/** Charge q = z·e in coulombs (signed). */
export function speciesChargeC(ref: SpeciesRef): number {
  return resolveSpecies(ref).chargeNumber * ELEMENTARY_CHARGE_C;
}
