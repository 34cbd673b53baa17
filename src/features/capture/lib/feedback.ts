/**
 * The instant feedback of the capture forms, computed from shared/physics as soon as a field is typed:
 * the station's safety class against the survey's zone set (with its caution and the general
 * cautions), and the electron and proton (or the survey's species) cyclotron lines n·f_c for
 * n = 1..maxHarmonic, each widened by the instrument's relative uncertainty, checked against the
 * watch bands.
 *
 * Lines are the cold, non-relativistic ones (kinetic energy 0): a surveyor has no plasma energy to
 * hand at a station, and the shift is below 0.2 % under 1 keV (REFERENCES.md).
 */
import {
  classifyField,
  createZoneSet,
  findLineBandHits,
  IEC_60601_2_33_ED4_ZONE_SET,
  lineBandHz,
  resolveSpecies,
  type LabelledLineBand,
  type LineBandHit,
  type SafetyClassification,
  type ZoneSet,
} from '@shared/physics';
import type { OfflineWatchBand, OfflineZoneSet } from '@shared/schemas/offline';
import type { SPECIES } from '@shared/schemas/vocabulary';

/** The survey's stored zone set in the shape shared/physics classifies against; thresholds sorted. */
export function toPhysicsZoneSet(zoneSet: OfflineZoneSet): ZoneSet {
  const thresholds = [...zoneSet.thresholds].sort((a, b) => a.fieldT - b.fieldT);
  return createZoneSet({
    id: zoneSet.id,
    name: zoneSet.name,
    follows: zoneSet.edition,
    belowLabel: `Below the lowest line (${thresholds[0]?.name ?? 'none'})`,
    thresholds: thresholds.map((t, i) => ({
      id: `${zoneSet.id}-${i}`,
      label: t.name,
      thresholdTesla: t.fieldT,
      source: zoneSet.edition,
      caution: t.caution,
      recalled: false,
    })),
  });
}

export interface FeedbackSettings {
  /** Species whose lines the survey predicts (survey.species). */
  species: readonly (typeof SPECIES)[number][];
  maxHarmonic: number;
  zoneSet: OfflineZoneSet | null;
  watchBands: readonly OfflineWatchBand[];
}

export interface FeedbackLine extends LabelledLineBand {
  speciesName: string;
  /** Centre n·f_c(|B|), Hz. */
  centreHz: number;
  /** Watch bands this line touches. */
  hits: LineBandHit[];
}

export interface FieldFeedback {
  fieldT: number;
  classification: SafetyClassification;
  /** True when the survey has no zone set and the default edition is shown instead. */
  zoneSetIsDefault: boolean;
  relativeUncertainty: number;
  lines: FeedbackLine[];
  hits: LineBandHit[];
}

/** Feedback for |B| = fieldT (tesla, > 0) measured with relative uncertainty u (0 ≤ u < 1). */
export function computeFieldFeedback(fieldT: number, relativeUncertainty: number | null, settings: FeedbackSettings): FieldFeedback | null {
  if (!(fieldT > 0) || !Number.isFinite(fieldT)) return null;
  const u = relativeUncertainty !== null && relativeUncertainty >= 0 && relativeUncertainty < 1 ? relativeUncertainty : 0;
  const zoneSet = settings.zoneSet ? toPhysicsZoneSet(settings.zoneSet) : IEC_60601_2_33_ED4_ZONE_SET;
  const classification = classifyField(fieldT, zoneSet);
  const bands = settings.watchBands.map((b) => ({ id: b.id, name: b.name, lowHz: b.lowerHz, highHz: b.upperHz }));
  const species = settings.species.length > 0 ? settings.species : (['electron', 'proton'] as const);
  const lines: FeedbackLine[] = [];
  for (const speciesId of species) {
    const speciesName = resolveSpecies(speciesId).name;
    for (let n = 1; n <= settings.maxHarmonic; n++) {
      const band = lineBandHz({ species: speciesId, harmonic: n, fieldMinTesla: fieldT, fieldMaxTesla: fieldT, relativeUncertainty: u });
      const centre = lineBandHz({ species: speciesId, harmonic: n, fieldMinTesla: fieldT, fieldMaxTesla: fieldT });
      const line: LabelledLineBand = { speciesId, harmonic: n, lowHz: band.lowHz, highHz: band.highHz };
      lines.push({ ...line, speciesName, centreHz: centre.lowHz, hits: findLineBandHits([line], bands) });
    }
  }
  return {
    fieldT,
    classification,
    zoneSetIsDefault: settings.zoneSet === null,
    relativeUncertainty: u,
    lines,
    hits: lines.flatMap((l) => l.hits),
  };
}

/** "2nd harmonic" style labels. */
export function harmonicLabel(n: number): string {
  if (n === 1) return 'fundamental';
  const suffix = n % 100 >= 11 && n % 100 <= 13 ? 'th' : ({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th';
  return `${n}${suffix} harmonic`;
}
