/**
 * The Earth's background field at a site, from the World Magnetic Model (NOAA NCEI / BGS) through the
 * npm package `geomagnetism` (WMM2015, WMM2020 and WMM2025 coefficient files; the model epoch is chosen
 * from the date). The Earth's field is about 22–67 µT at the surface: readings near it are shown with
 * it, and, where three components are known in geographic axes, with it subtracted as a vector.
 *
 * Altitude is height above the WGS-84 ellipsoid (the WMM's convention; the package takes kilometres).
 * The WMM is valid from 1 km below to 850 km above the ellipsoid (WMM technical report; recalled).
 * The package converts a date to a decimal year with 365-day years; the difference is < 1 day.
 */

import geomagnetism from 'geomagnetism';
import { PhysicsInputError, requireFinite, requireInRange, requirePositive } from './errors';

/** Where and when to evaluate the background field. */
export interface BackgroundSite {
  readonly latitudeDeg: number;
  readonly longitudeDeg: number;
  /** Height above the WGS-84 ellipsoid, m. */
  readonly altitudeM: number;
  readonly date: Date;
}

/** The Earth's field at a site, SI. */
export interface BackgroundField {
  /** X: geographic north component, T. */
  readonly northTesla: number;
  /** Y: east component, T. */
  readonly eastTesla: number;
  /** Z: vertical component, positive DOWN, T. */
  readonly downTesla: number;
  readonly horizontalTesla: number;
  readonly totalTesla: number;
  /** Inclination (dip), degrees, positive down. */
  readonly inclinationDeg: number;
  /** Declination, degrees east of true north. */
  readonly declinationDeg: number;
  /** Model used, e.g. "WMM-2025" (as the package names it). */
  readonly model: string;
}

const NANOTESLA = 1e-9;

/**
 * Background field from the World Magnetic Model at a site and date (NOAA/BGS WMM via `geomagnetism`).
 * Throws OUT_OF_RANGE outside the models' dates (the package's strict mode) or altitudes.
 */
export function earthBackgroundField(site: BackgroundSite): BackgroundField {
  requireInRange(site.latitudeDeg, 'latitudeDeg', -90, 90, '°');
  requireInRange(site.longitudeDeg, 'longitudeDeg', -180, 360, '°');
  requireInRange(site.altitudeM, 'altitudeM', -1_000, 850_000, 'm');
  if (!(site.date instanceof Date) || Number.isNaN(site.date.getTime())) {
    throw new PhysicsInputError('NOT_A_NUMBER', 'date must be a valid date.', { field: 'date', value: site.date });
  }
  let point;
  let name: string;
  try {
    const model = geomagnetism.model(site.date, { allowOutOfBoundsModel: false });
    name = model.name;
    point = model.point([site.latitudeDeg, site.longitudeDeg, site.altitudeM / 1000]);
  } catch (error) {
    throw new PhysicsInputError(
      'OUT_OF_RANGE',
      `No World Magnetic Model covers ${site.date.toISOString().slice(0, 10)}: ${(error as Error).message}`,
      { field: 'date', value: site.date },
    );
  }
  const values = [point.x, point.y, point.z, point.h, point.f, point.incl, point.decl];
  values.forEach((v) => requireFinite(v, 'worldMagneticModel'));
  return {
    northTesla: point.x * NANOTESLA,
    eastTesla: point.y * NANOTESLA,
    downTesla: point.z * NANOTESLA,
    horizontalTesla: point.h * NANOTESLA,
    totalTesla: point.f * NANOTESLA,
    inclinationDeg: point.incl,
    declinationDeg: point.decl,
    model: name,
  };
}

/** A three-component reading in geographic axes (north, east, down), T. */
export interface FieldComponentsTesla {
  readonly northTesla: number;
  readonly eastTesla: number;
  readonly downTesla: number;
}

/**
 * Vector subtraction of the background: B_source = B_measured − B_earth, component by component, and its
 * magnitude. Only meaningful when the probe's axes were aligned to geographic north, east and down
 * (or rotated there); a magnitude-only reading cannot be corrected this way — compare it with
 * {@link compareWithBackground} instead.
 */
export function subtractBackground(
  reading: FieldComponentsTesla,
  background: FieldComponentsTesla,
): FieldComponentsTesla & { readonly magnitudeTesla: number } {
  requireFinite(reading.northTesla, 'northTesla');
  requireFinite(reading.eastTesla, 'eastTesla');
  requireFinite(reading.downTesla, 'downTesla');
  requireFinite(background.northTesla, 'background.northTesla');
  requireFinite(background.eastTesla, 'background.eastTesla');
  requireFinite(background.downTesla, 'background.downTesla');
  const northTesla = reading.northTesla - background.northTesla;
  const eastTesla = reading.eastTesla - background.eastTesla;
  const downTesla = reading.downTesla - background.downTesla;
  return { northTesla, eastTesla, downTesla, magnitudeTesla: Math.hypot(northTesla, eastTesla, downTesla) };
}

/**
 * How a magnitude reading compares with the background: ratio |B|/|B_earth| and whether it lies within
 * `nearFactor` of it (default 3: a reading under ~3× the Earth's field is dominated by it, and by
 * building steel, rather than by the magnet).
 */
export function compareWithBackground(
  fieldTesla: number,
  background: BackgroundField,
  nearFactor = 3,
): { readonly ratio: number; readonly nearBackground: boolean } {
  requirePositive(fieldTesla, 'fieldTesla');
  requirePositive(background.totalTesla, 'background.totalTesla');
  requireInRange(nearFactor, 'nearFactor', 1, 1000);
  const ratio = fieldTesla / background.totalTesla;
  return { ratio, nearBackground: ratio <= nearFactor };
}
