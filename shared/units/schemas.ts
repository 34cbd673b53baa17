/**
 * zod schemas that turn a typed "<number> <unit>" string into its SI value, for forms
 * (react-hook-form's zod resolver) and the server's validation alike. A failure is one zod issue whose
 * message is the {@link PhysicsInputError} message and whose `params.code` is its stable code.
 */

import { z } from 'zod';
import { isPhysicsInputError } from '../physics/errors';
import { parseQuantity, unitsFor, type QuantityKind } from './units';

/** A zod schema: string → SI number for the given quantity (see units.ts for the accepted units). */
export function quantityTextSchema(kind: QuantityKind) {
  unitsFor(kind); // throws INVALID_INPUT for an unknown quantity now, not at the first parse
  return z.string().transform((text, ctx) => {
    try {
      return parseQuantity(kind, text).valueSi;
    } catch (error) {
      if (!isPhysicsInputError(error)) throw error;
      ctx.addIssue({ code: 'custom', message: error.message, params: { code: error.code } });
      return z.NEVER;
    }
  });
}

/** "0.5 mT" → 0.0005 (T). */
export const fluxDensityTextSchema = quantityTextSchema('fluxDensity');
/** "2.45 GHz" → 2.45e9 (Hz). */
export const frequencyTextSchema = quantityTextSchema('frequency');
/** "-30 dBm" → 1e-6 (W). */
export const powerTextSchema = quantityTextSchema('power');
/** "10 keV" → J. */
export const energyTextSchema = quantityTextSchema('energy');
/** "120 cm" → 1.2 (m). */
export const lengthTextSchema = quantityTextSchema('length');
