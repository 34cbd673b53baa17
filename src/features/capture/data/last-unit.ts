import { useLiveQuery } from 'dexie-react-hooks';
import { FieldUnitSchema } from '@shared/schemas/vocabulary';
import { db, toCaptureError, type FieldUnit } from '@/db';

const LAST_UNIT_KEY = 'lastFieldUnit';
/** What the unit picker shows before the surveyor has chosen one: most handheld gaussmeters read in mT (common practice). */
export const DEFAULT_FIELD_UNIT: FieldUnit = 'mT';

/** The unit of the last reading typed on this device; DEFAULT_FIELD_UNIT until one is chosen, undefined while loading. */
export function useLastFieldUnit(): FieldUnit | undefined {
  return useLiveQuery(async () => {
    const parsed = FieldUnitSchema.safeParse((await db.meta.get(LAST_UNIT_KEY))?.value);
    return parsed.success ? parsed.data : DEFAULT_FIELD_UNIT;
  }, []);
}

export async function setLastFieldUnit(unit: FieldUnit): Promise<void> {
  const parsed = FieldUnitSchema.parse(unit);
  try {
    await db.meta.put({ key: LAST_UNIT_KEY, value: parsed });
  } catch (error) {
    throw toCaptureError(error);
  }
}
