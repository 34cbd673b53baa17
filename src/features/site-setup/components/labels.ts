/** On-screen words for the closed word lists of shared/schemas/vocabulary.ts. */
import type { z } from 'zod';
import type {
  ElectronEnergyKindSchema,
  EmitterKindSchema,
  InstrumentKindSchema,
  MagnetShieldingSchema,
  RoomSensitivitySchema,
  SourceKindSchema,
  SourceStateSchema,
  SpeciesSchema,
} from '@shared/schemas/vocabulary';

export const SOURCE_KIND_LABELS: Record<z.infer<typeof SourceKindSchema>, string> = {
  mri: 'MRI scanner',
  nmr: 'NMR spectrometer',
  cyclotron: 'Cyclotron',
  beam_line: 'Beam-line magnet',
  test_magnet: 'Test magnet',
  other: 'Other magnet',
};
export const SOURCE_STATE_LABELS: Record<z.infer<typeof SourceStateSchema>, string> = { at_field: 'At field', ramped_down: 'Ramped down' };
export const SHIELDING_LABELS: Record<z.infer<typeof MagnetShieldingSchema>, string> = {
  active: 'Actively shielded',
  passive: 'Passively shielded',
  unshielded: 'Unshielded',
  unknown: 'Not known',
};
export const EMITTER_KIND_LABELS: Record<z.infer<typeof EmitterKindSchema>, string> = {
  discharge_lamp: 'Discharge lamp',
  ion_gauge: 'Ion gauge',
  ion_source: 'Ion source',
  plasma_tool: 'Plasma tool',
  other: 'Other plasma device',
};
export const ENERGY_KIND_LABELS: Record<z.infer<typeof ElectronEnergyKindSchema>, string> = {
  total: 'Total (isotropic plasma)',
  perpendicular: 'Perpendicular part only',
};
export const SENSITIVITY_LABELS: Record<z.infer<typeof RoomSensitivitySchema>, string> = { none: 'None', low: 'Low', medium: 'Medium', high: 'High' };
export const INSTRUMENT_KIND_LABELS: Record<z.infer<typeof InstrumentKindSchema>, string> = {
  gaussmeter: 'Gaussmeter',
  analyser: 'Spectrum analyser',
  antenna: 'Antenna',
};
export const SPECIES_LABELS: Record<z.infer<typeof SpeciesSchema>, string> = {
  electron: 'Electron',
  proton: 'Proton',
  deuteron: 'Deuteron',
  alpha: 'Alpha particle',
  helion: 'Helion (³He²⁺)',
  'h-minus': 'H⁻ ion',
  'h2-plus': 'H₂⁺ ion',
};
