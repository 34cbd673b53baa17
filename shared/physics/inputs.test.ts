/**
 * Every public function of shared/physics and shared/units, fed NaN, ±Infinity, a zero or negative
 * field, an out-of-range energy or an unknown species, raises PhysicsInputError — never a silent NaN.
 * The first test fails when a new export has no row here, so coverage cannot quietly lapse.
 */
import { describe, expect, it } from 'vitest';
import * as units from '../units/index';
import * as physics from './index';

const E = 1.602176634e-19;
const BAD_NUMBERS = [NaN, Infinity, -Infinity];
const BAD_FIELDS = [0, -1e-3, ...BAD_NUMBERS];
const BAD_ENERGIES = [-E, 2e12 * E, ...BAD_NUMBERS]; // negative, above 1 TeV, non-finite
const UNKNOWN_SPECIES = 'muon' as never;
const f64 = (...v: number[]) => Float64Array.from(v);
const stations = { xM: f64(0, 1, 0, 1), yM: f64(0, 0, 1, 1) };
const magnet: physics.DipoleModel = { sourceM: [0, 0, 0], momentAm2: [0, 0, 1e6] };
const grid = physics.interpolateLogFieldGrid({ ...stations, fieldsTesla: f64(1e-3, 1e-3, 1e-3, 1e-3) }, { originXM: 0, originYM: 0, cellSizeM: 0.1, width: 10, height: 10 });
const background = physics.earthBackgroundField({ latitudeDeg: 52, longitudeDeg: 0, altitudeM: 0, date: new Date(Date.UTC(2026, 0, 1)) });
const fitStations = (b: number) => {
  const n = 8;
  const xM = f64(...Array.from({ length: n }, (_, i) => 3 + i));
  const yM = f64(...Array.from({ length: n }, (_, i) => (i % 3) - 1));
  const zM = new Float64Array(n);
  const fieldsTesla = f64(...Array.from({ length: n }, (_, i) => (i === 2 ? b : 1e-3)));
  return { xM, yM, zM, fieldsTesla };
};

type Bad = Array<() => unknown>;
const each = <T>(values: T[], call: (v: T) => unknown): Bad => values.map((v) => () => call(v));

/** For each export: calls that must throw PhysicsInputError. */
const CASES: Record<string, Bad> = {
  // errors.ts guards
  requireFinite: each(BAD_NUMBERS, (v) => physics.requireFinite(v, 'x')),
  requireNonNegative: each([-1, ...BAD_NUMBERS], (v) => physics.requireNonNegative(v, 'x')),
  requirePositive: each(BAD_FIELDS, (v) => physics.requirePositive(v, 'x')),
  requireInRange: each([2, ...BAD_NUMBERS], (v) => physics.requireInRange(v, 'x', 0, 1)),
  requireInteger: each([0.5, ...BAD_NUMBERS], (v) => physics.requireInteger(v, 'x', 0, 10)),
  requireArray: each(BAD_FIELDS, (v) => physics.requireArray(f64(1, v), 'x', 'positive')),
  requireSameLength: [() => physics.requireSameLength(2, { a: f64(1) })],
  // constants.ts
  restEnergyJ: each(BAD_FIELDS, (v) => physics.restEnergyJ(v)),
  electronVoltsToJoules: each(BAD_NUMBERS, (v) => physics.electronVoltsToJoules(v)),
  joulesToElectronVolts: each(BAD_NUMBERS, (v) => physics.joulesToElectronVolts(v)),
  // species.ts
  resolveSpecies: [() => physics.resolveSpecies(UNKNOWN_SPECIES)],
  speciesChargeC: [() => physics.speciesChargeC(UNKNOWN_SPECIES)],
  customSpecies: each(BAD_FIELDS, (v) => physics.customSpecies({ id: 'x', name: 'x', chargeNumber: 1, massU: v })),
  ionMassFromNeutralAtomKg: each(BAD_FIELDS, (v) => physics.ionMassFromNeutralAtomKg(v, 1)),
  // kinematics.ts
  requireKineticEnergyJ: each(BAD_ENERGIES, (v) => physics.requireKineticEnergyJ(v)),
  requireFieldTesla: each(BAD_FIELDS, (v) => physics.requireFieldTesla(v)),
  resolveSpeciesAndEnergy: [...each(BAD_ENERGIES, (v) => physics.resolveSpeciesAndEnergy('proton', v)), () => physics.resolveSpeciesAndEnergy(UNKNOWN_SPECIES, 0)],
  lorentzFactor: [...each(BAD_ENERGIES, (v) => physics.lorentzFactor('proton', v)), () => physics.lorentzFactor(UNKNOWN_SPECIES, E)],
  betaFromKineticEnergy: [...each(BAD_ENERGIES, (v) => physics.betaFromKineticEnergy('proton', v)), () => physics.betaFromKineticEnergy(UNKNOWN_SPECIES, E)],
  speedFromKineticEnergyMPerS: [...each(BAD_ENERGIES, (v) => physics.speedFromKineticEnergyMPerS('proton', v)), () => physics.speedFromKineticEnergyMPerS(UNKNOWN_SPECIES, E)],
  momentumFromKineticEnergyKgMPerS: [...each(BAD_ENERGIES, (v) => physics.momentumFromKineticEnergyKgMPerS('proton', v)), () => physics.momentumFromKineticEnergyKgMPerS(UNKNOWN_SPECIES, E)],
  kineticEnergyFromSpeedJ: [...each([-1, 3e8, ...BAD_NUMBERS], (v) => physics.kineticEnergyFromSpeedJ('proton', v)), () => physics.kineticEnergyFromSpeedJ(UNKNOWN_SPECIES, 1)],
  magneticRigidityTeslaMetre: [...each(BAD_ENERGIES, (v) => physics.magneticRigidityTeslaMetre('proton', v)), () => physics.magneticRigidityTeslaMetre(UNKNOWN_SPECIES, E)],
  gyroradiusM: [
    ...each(BAD_FIELDS, (v) => physics.gyroradiusM('proton', v, E)),
    ...each(BAD_ENERGIES, (v) => physics.gyroradiusM('proton', 1, v)),
    () => physics.gyroradiusM(UNKNOWN_SPECIES, 1, E),
  ],
  gyroradiusFromSpeedM: [...each(BAD_FIELDS, (v) => physics.gyroradiusFromSpeedM('proton', v, 1e5)), () => physics.gyroradiusFromSpeedM(UNKNOWN_SPECIES, 1, 1e5)],
  // lines.ts
  angularCyclotronFrequencyRadPerS: [
    ...each(BAD_FIELDS, (v) => physics.angularCyclotronFrequencyRadPerS('electron', v)),
    ...each(BAD_ENERGIES, (v) => physics.angularCyclotronFrequencyRadPerS('electron', 1, v)),
    () => physics.angularCyclotronFrequencyRadPerS(UNKNOWN_SPECIES, 1),
  ],
  cyclotronFrequencyHz: [
    ...each(BAD_FIELDS, (v) => physics.cyclotronFrequencyHz('electron', v)),
    ...each(BAD_ENERGIES, (v) => physics.cyclotronFrequencyHz('electron', 1, v)),
    () => physics.cyclotronFrequencyHz(UNKNOWN_SPECIES, 1),
  ],
  cyclotronHzPerTesla: [...each(BAD_ENERGIES, (v) => physics.cyclotronHzPerTesla('electron', v)), () => physics.cyclotronHzPerTesla(UNKNOWN_SPECIES)],
  harmonicFrequenciesHz: [
    ...each(BAD_FIELDS, (v) => physics.harmonicFrequenciesHz('electron', v, 3)),
    ...each(BAD_ENERGIES, (v) => physics.harmonicFrequenciesHz('electron', 1, 3, v)),
    () => physics.harmonicFrequenciesHz(UNKNOWN_SPECIES, 1, 3),
  ],
  lineBandHz: [
    ...each(BAD_FIELDS, (v) => physics.lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: v, fieldMaxTesla: 1 })),
    ...each(BAD_ENERGIES, (v) => physics.lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: 1, fieldMaxTesla: 1, kineticEnergyMinJ: v })),
    () => physics.lineBandHz({ species: UNKNOWN_SPECIES, harmonic: 1, fieldMinTesla: 1, fieldMaxTesla: 1 }),
  ],
  requireRelativeUncertainty: each([-0.1, 1, ...BAD_NUMBERS], (v) => physics.requireRelativeUncertainty(v)),
  cyclotronFrequenciesHz: [
    ...each(BAD_FIELDS, (v) => physics.cyclotronFrequenciesHz('electron', f64(1, v))),
    ...each(BAD_ENERGIES, (v) => physics.cyclotronFrequenciesHz('electron', f64(1), v)),
    () => physics.cyclotronFrequenciesHz(UNKNOWN_SPECIES, f64(1)),
  ],
  stationLineBandsHz: [
    ...each(BAD_FIELDS, (v) => physics.stationLineBandsHz('electron', f64(1, v), 1, 0)),
    ...each(BAD_ENERGIES, (v) => physics.stationLineBandsHz('electron', f64(1), 1, 0, v)),
    () => physics.stationLineBandsHz(UNKNOWN_SPECIES, f64(1), 1, 0),
  ],
  protonPrecessionFrequencyHz: each(BAD_FIELDS, (v) => physics.protonPrecessionFrequencyHz(v)),
  // bands.ts
  bandOverlap: each([-1, ...BAD_NUMBERS], (v) => physics.bandOverlap({ lowHz: v, highHz: 1 }, { lowHz: 0, highHz: 1 })),
  findLineBandHits: each([-1, ...BAD_NUMBERS], (v) => physics.findLineBandHits([{ lowHz: v, highHz: 1, speciesId: 'electron', harmonic: 1 }], [{ id: 'w', lowHz: 0, highHz: 2 }])),
  findStationBandHits: [
    ...each(BAD_FIELDS, (v) => physics.findStationBandHits({ fieldsTesla: f64(1, v), relativeUncertainty: 0, species: ['electron'], harmonicCount: 1, watchBands: [] })),
    ...each(BAD_ENERGIES, (v) =>
      physics.findStationBandHits({ fieldsTesla: f64(1), relativeUncertainty: 0, species: [{ species: 'electron', kineticEnergyJ: v }], harmonicCount: 1, watchBands: [] }),
    ),
    () => physics.findStationBandHits({ fieldsTesla: f64(1), relativeUncertainty: 0, species: [UNKNOWN_SPECIES], harmonicCount: 1, watchBands: [] }),
  ],
  // emission.ts
  larmorPowerW: [...each([0, ...BAD_NUMBERS], (v) => physics.larmorPowerW(v, 1)), ...each([-1, ...BAD_NUMBERS], (v) => physics.larmorPowerW(E, v))],
  larmorPowerCircularW: [...each(BAD_FIELDS, (v) => physics.larmorPowerCircularW('electron', v, 1e5)), () => physics.larmorPowerCircularW(UNKNOWN_SPECIES, 1, 1e5)],
  gyroRadiationPowerW: [
    ...each(BAD_FIELDS, (v) => physics.gyroRadiationPowerW('electron', v, E)),
    ...each(BAD_ENERGIES, (v) => physics.gyroRadiationPowerW('electron', 1, v)),
    () => physics.gyroRadiationPowerW(UNKNOWN_SPECIES, 1, E),
  ],
  meanPerpendicularEnergyJ: each([-E, ...BAD_NUMBERS], (v) => physics.meanPerpendicularEnergyJ(v, 'perpendicular')),
  perVolumeEmissionWPerM3: [
    ...each(BAD_FIELDS, (v) => physics.perVolumeEmissionWPerM3({ densityPerM3: 1e16, fieldTesla: v, energyJ: E, energyKind: 'temperature' })),
    ...each([-E, 1e5 * E, ...BAD_NUMBERS], (v) => physics.perVolumeEmissionWPerM3({ densityPerM3: 1e16, fieldTesla: 1, energyJ: v, energyKind: 'temperature' })),
    () => physics.perVolumeEmissionWPerM3({ densityPerM3: 1e16, fieldTesla: 1, energyJ: E, energyKind: 'temperature', species: UNKNOWN_SPECIES }),
  ],
  totalEmissionPowerW: [
    ...each(BAD_FIELDS, (v) => physics.totalEmissionPowerW({ densityPerM3: 1e16, fieldTesla: v, energyJ: E, energyKind: 'temperature', volumeM3: 1 })),
    ...each(BAD_ENERGIES, (v) => physics.totalEmissionPowerW({ densityPerM3: 1e16, fieldTesla: 1, energyJ: v, energyKind: 'temperature', volumeM3: 1 })),
  ],
  isotropicFluxDensityWPerM2: [...each(BAD_NUMBERS, (v) => physics.isotropicFluxDensityWPerM2(v, 1)), ...each([0, -1, ...BAD_NUMBERS], (v) => physics.isotropicFluxDensityWPerM2(1, v))],
  // analyser.ts
  dbmToWatts: each(BAD_NUMBERS, (v) => physics.dbmToWatts(v)),
  wattsToDbm: each([0, -1, ...BAD_NUMBERS], (v) => physics.wattsToDbm(v)),
  dbwToWatts: each(BAD_NUMBERS, (v) => physics.dbwToWatts(v)),
  wattsToDbw: each([0, -1, ...BAD_NUMBERS], (v) => physics.wattsToDbw(v)),
  dbuvMinusDbm: each([0, -50, ...BAD_NUMBERS], (v) => physics.dbuvMinusDbm(v)),
  dbuvToDbm: each(BAD_NUMBERS, (v) => physics.dbuvToDbm(v)),
  dbmToDbuv: each(BAD_NUMBERS, (v) => physics.dbmToDbuv(v)),
  fieldStrengthDbuvPerM: each(BAD_NUMBERS, (v) => physics.fieldStrengthDbuvPerM(v, 10)),
  fieldStrengthFromDbmDbuvPerM: each(BAD_NUMBERS, (v) => physics.fieldStrengthFromDbmDbuvPerM(v, 10)),
  wavelengthM: each([0, -1, ...BAD_NUMBERS], (v) => physics.wavelengthM(v)),
  antennaFactorDbPerM: each([0, -1, ...BAD_NUMBERS], (v) => physics.antennaFactorDbPerM(v, 0)),
  fluxDensityFromFieldStrengthWPerM2: each([-1, ...BAD_NUMBERS], (v) => physics.fluxDensityFromFieldStrengthWPerM2(v)),
  fieldStrengthFromFluxDensityVPerM: each([-1, ...BAD_NUMBERS], (v) => physics.fieldStrengthFromFluxDensityVPerM(v)),
  fluxDensityDbwPerM2FromDbuvPerM: each(BAD_NUMBERS, (v) => physics.fluxDensityDbwPerM2FromDbuvPerM(v)),
  dbuvPerMFromFluxDensityDbwPerM2: each(BAD_NUMBERS, (v) => physics.dbuvPerMFromFluxDensityDbwPerM2(v)),
  displayedNoiseFloorDbm: each([0, -1, ...BAD_NUMBERS], (v) => physics.displayedNoiseFloorDbm(-150, v)),
  effectiveApertureM2: each([0, -1, ...BAD_NUMBERS], (v) => physics.effectiveApertureM2(v, 0)),
  receivedPowerW: each([-1, ...BAD_NUMBERS], (v) => physics.receivedPowerW(v, 1e9, 0)),
  farFieldDistanceM: each([0, -1, ...BAD_NUMBERS], (v) => physics.farFieldDistanceM(v, 1e9)),
  voltsToDbuv: each([0, -1, ...BAD_NUMBERS], (v) => physics.voltsToDbuv(v)),
  dbuvToVolts: each(BAD_NUMBERS, (v) => physics.dbuvToVolts(v)),
  // safety.ts
  createZoneSet: [() => physics.createZoneSet({}), () => physics.createZoneSet(null)],
  classifyField: each(BAD_FIELDS, (v) => physics.classifyField(v, physics.EU_2013_35_ZONE_SET)),
  // field-grid.ts
  gridForStations: each(BAD_NUMBERS, (v) => physics.gridForStations(f64(0, v), f64(0, 1), 4, 4)),
  interpolateLogFieldGrid: each(BAD_FIELDS, (v) =>
    physics.interpolateLogFieldGrid({ ...stations, fieldsTesla: f64(1e-3, v, 1e-3, 1e-3) }, { originXM: 0, originYM: 0, cellSizeM: 0.1, width: 4, height: 4 }),
  ),
  isogaussContours: each(BAD_FIELDS, (v) => physics.isogaussContours(grid, [v])),
  gridCellFieldTesla: each([-1, 0.5, ...BAD_NUMBERS], (v) => physics.gridCellFieldTesla(grid, v, 0)),
  // dipole.ts
  dipoleFieldVectorTesla: each(BAD_NUMBERS, (v) => physics.dipoleFieldVectorTesla(magnet, [v, 0, 0])),
  dipoleFieldMagnitudeTesla: each(BAD_NUMBERS, (v) => physics.dipoleFieldMagnitudeTesla(magnet, [1, v, 0])),
  dipoleThresholdRadiusM: each(BAD_FIELDS, (v) => physics.dipoleThresholdRadiusM(magnet, v, [1, 0, 0])),
  distanceToThresholdAlongRayM: each(BAD_FIELDS, (v) => physics.distanceToThresholdAlongRayM(magnet, [1, 0, 0], [1, 0, 0], v)),
  fitDipole: each(BAD_FIELDS, (v) => physics.fitDipole(fitStations(v))),
  // repeats.ts
  enNumber: each(BAD_NUMBERS, (v) => physics.enNumber(v, 1, 1, 1)),
  groupRepeatReadings: each(BAD_FIELDS, (v) => physics.groupRepeatReadings([{ id: 'a', xM: 0, yM: 0, fieldTesla: v, expandedUncertaintyTesla: 1e-6 }], { radiusM: 1 })),
  // background.ts
  earthBackgroundField: each(BAD_NUMBERS, (v) => physics.earthBackgroundField({ latitudeDeg: v, longitudeDeg: 0, altitudeM: 0, date: new Date() })),
  subtractBackground: each(BAD_NUMBERS, (v) => physics.subtractBackground({ northTesla: v, eastTesla: 0, downTesla: 0 }, background)),
  compareWithBackground: each(BAD_FIELDS, (v) => physics.compareWithBackground(v, background)),
  // units
  unitsFor: [() => units.unitsFor('pressure' as never)],
  toSi: [...each([-1, ...BAD_NUMBERS], (v) => units.toSi('fluxDensity', v, 'mT')), () => units.toSi('fluxDensity', 1, 'Wb')],
  fromSi: [...each([-1, ...BAD_NUMBERS], (v) => units.fromSi('fluxDensity', v, 'mT')), () => units.fromSi('power', 0, 'dBm')],
  parseQuantity: each(['', 'NaN T', 'Infinity T', '-1 T', '1 Wb'], (t) => units.parseQuantity('fluxDensity', t)),
  parseFluxDensityTesla: each(['', 'NaN mT', '-Infinity mT', '-3 mT', '3 MT'], (t) => units.parseFluxDensityTesla(t)),
  parseFrequencyHz: each(['', 'NaN Hz', 'Infinity GHz', '-1 MHz', '1 mT'], (t) => units.parseFrequencyHz(t)),
  parsePowerW: each(['', 'NaN dBm', 'Infinity W', '-1 W', '1 dB'], (t) => units.parsePowerW(t)),
  parseEnergyJ: each(['', 'NaN eV', 'Infinity keV', '-1 MeV', '1 GeV'], (t) => units.parseEnergyJ(t)),
  parseLengthM: each(['', 'NaN m', 'Infinity cm', '-1 mm', '1 ft'], (t) => units.parseLengthM(t)),
  formatQuantity: each([-1, ...BAD_NUMBERS], (v) => units.formatQuantity('length', v)),
  formatFluxDensity: each([-1, ...BAD_NUMBERS], (v) => units.formatFluxDensity(v)),
  formatFrequency: each([-1, ...BAD_NUMBERS], (v) => units.formatFrequency(v)),
  formatPower: each([-1, ...BAD_NUMBERS], (v) => units.formatPower(v)),
  formatEnergy: each([-1, ...BAD_NUMBERS], (v) => units.formatEnergy(v)),
  formatLength: each([-1, ...BAD_NUMBERS], (v) => units.formatLength(v)),
  quantityTextSchema: [() => units.quantityTextSchema('pressure' as never)],
};

/** Exports that are not computations: the error class and its type guard. */
const EXEMPT = new Set(['PhysicsInputError', 'isPhysicsInputError']);

describe('every public function rejects bad input with PhysicsInputError', () => {
  const exported = [...Object.entries(physics), ...Object.entries(units)].filter(([name, value]) => typeof value === 'function' && !EXEMPT.has(name));

  it('has a row for every exported function', () => {
    const missing = exported.map(([name]) => name).filter((name) => !(name in CASES));
    expect(missing).toEqual([]);
    expect(exported.length).toBeGreaterThan(80);
  });

  it.each(Object.entries(CASES))('%s', (_name, calls) => {
    expect(calls.length).toBeGreaterThan(0);
    for (const call of calls) expect(call).toThrow(physics.PhysicsInputError);
  });

  it('the typed error carries a stable code, the field and a message a form can show', () => {
    try {
      physics.cyclotronFrequencyHz('electron', -1);
      expect.unreachable();
    } catch (error) {
      expect(physics.isPhysicsInputError(error, 'NOT_POSITIVE')).toBe(true);
      expect((error as physics.PhysicsInputError).field).toBe('fieldTesla');
      expect((error as Error).message).toMatch(/greater than zero/);
      expect((error as Error).name).toBe('PhysicsInputError');
    }
  });
});
