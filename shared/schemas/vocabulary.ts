/**
 * The closed word lists of DESIGN.md §3, once for both sides: the server's PostgreSQL enums
 * (server/db/schema) and the zod schemas of the wire contract are built from these arrays, so a value
 * the form offers is always one the database accepts. Adding a value is a migration (ALTER TYPE … ADD
 * VALUE), so append; never reorder or rename.
 */
import { z } from 'zod';

/** What kind of magnet a Source is (issue 6 §5). */
export const SOURCE_KINDS = ['mri', 'nmr', 'cyclotron', 'beam_line', 'test_magnet', 'other'] as const;
export const SourceKindSchema = z.enum(SOURCE_KINDS);

/** Whether a magnet is energised: a ramped-down magnet gives no fringe field to predict from. */
export const SOURCE_STATES = ['at_field', 'ramped_down'] as const;
export const SourceStateSchema = z.enum(SOURCE_STATES);

/** Shielding changes how fast the field falls off close in, so a dipole fit must know it. */
export const MAGNET_SHIELDINGS = ['active', 'passive', 'unshielded', 'unknown'] as const;
export const MagnetShieldingSchema = z.enum(MAGNET_SHIELDINGS);

/** Plasma-bearing devices (issue 6 §6). */
export const EMITTER_KINDS = ['discharge_lamp', 'ion_gauge', 'ion_source', 'plasma_tool', 'other'] as const;
export const EmitterKindSchema = z.enum(EMITTER_KINDS);

/**
 * Which electron energy an emitter's figure is: the mean total kinetic energy of an isotropic plasma,
 * or the perpendicular part only. The per-volume emission law changes by a factor 2/3 between them
 * (REFERENCES.md, "Per-volume emission").
 */
export const ELECTRON_ENERGY_KINDS = ['total', 'perpendicular'] as const;
export const ElectronEnergyKindSchema = z.enum(ELECTRON_ENERGY_KINDS);

/** How much a room cares about stray fields and emissions; drives flag severity and map shading. */
export const ROOM_SENSITIVITIES = ['none', 'low', 'medium', 'high'] as const;
export const RoomSensitivitySchema = z.enum(ROOM_SENSITIVITIES);

export const INSTRUMENT_KINDS = ['gaussmeter', 'analyser', 'antenna'] as const;
export const InstrumentKindSchema = z.enum(INSTRUMENT_KINDS);

/**
 * Units a surveyor may type a field in, spelled as shared/units displays them (µ is U+00B5). Stored
 * values are always tesla; this records what was typed.
 */
export const FIELD_UNITS = ['T', 'mT', 'µT', 'nT', 'G', 'mG', 'kG'] as const;
export const FieldUnitSchema = z.enum(FIELD_UNITS);

/** How a single-axis probe was held, or `three_axis` for a vector probe. */
export const PROBE_ORIENTATIONS = ['three_axis', 'vertical', 'horizontal', 'toward_source', 'other'] as const;
export const ProbeOrientationSchema = z.enum(PROBE_ORIENTATIONS);

/** Spectrum-analyser detectors (CISPR 16-1-1 names the peak, quasi-peak, average and rms detectors). */
export const DETECTORS = ['peak', 'quasi_peak', 'average', 'rms', 'sample'] as const;
export const DetectorSchema = z.enum(DETECTORS);

/** A reviewer's verdict on a reading (DESIGN.md §3). */
export const VERDICTS = ['accepted', 'remeasure', 'rejected'] as const;
export const VerdictSchema = z.enum(VERDICTS);

/** What a survey assignment lets a person do in that survey. */
export const ASSIGNMENT_ROLES = ['surveyor', 'reviewer'] as const;
export const AssignmentRoleSchema = z.enum(ASSIGNMENT_ROLES);

/** Findings (DESIGN.md §3: a line inside a watch band, a station above a safety line, repeats that disagree). */
export const FLAG_KINDS = ['line_in_band', 'above_safety_line', 'repeat_disagreement'] as const;
export const FlagKindSchema = z.enum(FLAG_KINDS);

/** A flag's life (issue 8 §3): open → acknowledged (with a note) → resolved (with the action taken). */
export const FLAG_STATES = ['open', 'acknowledged', 'resolved'] as const;
export const FlagStateSchema = z.enum(FLAG_STATES);

/** How much a watch band matters, and so how loud a flag raised against it is. */
export const SEVERITIES = ['low', 'medium', 'high', 'critical'] as const;
export const SeveritySchema = z.enum(SEVERITIES);

/** Charged species whose cyclotron lines a survey may predict: the built-in ids of shared/physics/species.ts. */
export const SPECIES = ['electron', 'proton', 'deuteron', 'alpha', 'helion', 'h-minus', 'h2-plus'] as const;
export const SpeciesSchema = z.enum(SPECIES);
