/**
 * The field unit the map shows, chosen by the person looking and kept on this device, and the labels
 * in it ("0.9 mT", "9 G"), plain digits for the usual range.
 */
import { FIELD_UNITS } from '@shared/schemas/vocabulary';
import { fromSi } from '@shared/units';

export type MapFieldUnit = (typeof FIELD_UNITS)[number];
export const MAP_FIELD_UNITS: readonly MapFieldUnit[] = FIELD_UNITS;
const STORAGE_KEY = 'fringewalk.map-unit';
export const DEFAULT_MAP_UNIT: MapFieldUnit = 'mT';

export function loadMapUnit(): MapFieldUnit {
  try {
    const saved = window.localStorage.getItem(STORAGE_KEY);
    return (MAP_FIELD_UNITS as readonly string[]).includes(saved ?? '') ? (saved as MapFieldUnit) : DEFAULT_MAP_UNIT;
  } catch {
    return DEFAULT_MAP_UNIT;
  }
}

export function saveMapUnit(unit: MapFieldUnit): void {
  try {
    window.localStorage.setItem(STORAGE_KEY, unit);
  } catch {
    // storage full or blocked: the choice lasts for this page only
  }
}

/** |B| (tesla) in `unit`, three significant figures. */
export function fieldLabel(fieldT: number, unit: MapFieldUnit): string {
  return `${Number(fromSi('fluxDensity', fieldT, unit).toPrecision(3))} ${unit}`;
}
