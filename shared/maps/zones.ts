/**
 * Safety classes on a survey map: the survey's stored zone set (server/db/schema/bands.ts: name, fieldT,
 * caution per line) in the shape shared/physics/safety.ts classifies against, each station's class, and
 * each room's highest class (the class of the highest |B| measured in it). Classification itself is
 * classifyField: a field AT or above a threshold is inside that zone.
 */
import { classifyField, createZoneSet, IEC_60601_2_33_ED4_ZONE_SET, type ZoneSet } from '../physics';

export interface StoredZoneSet {
  readonly id: string;
  readonly name: string;
  readonly edition: string;
  readonly thresholds: readonly { name: string; fieldT: number; caution: string }[];
}

/**
 * A stored zone set as a physics ZoneSet (thresholds sorted, equal values merged: the first name is
 * kept). A survey without a zone set is classed against IEC 60601-2-33 ed. 4 and the map says so.
 */
export function physicsZoneSet(stored: StoredZoneSet | null): ZoneSet {
  if (!stored) return IEC_60601_2_33_ED4_ZONE_SET;
  const sorted = [...stored.thresholds].filter((t) => t.fieldT > 0 && Number.isFinite(t.fieldT)).sort((a, b) => a.fieldT - b.fieldT);
  const unique = sorted.filter((t, i) => i === 0 || t.fieldT > (sorted[i - 1] as { fieldT: number }).fieldT);
  if (unique.length === 0) return IEC_60601_2_33_ED4_ZONE_SET;
  return createZoneSet({
    id: stored.id,
    name: stored.name,
    follows: stored.edition,
    belowLabel: `Below the lowest line (${unique[0]?.name ?? ''})`,
    thresholds: unique.map((t, i) => ({
      id: `${stored.id}-${i}`,
      label: t.name,
      thresholdTesla: t.fieldT,
      source: stored.edition,
      caution: t.caution || 'Follow local codes and the site’s MR safety officer.',
      recalled: false,
    })),
  });
}

/** Index of the highest threshold reached (−1: below all), or null for no value. */
export function zoneIndexOf(fieldT: number | null, zoneSet: ZoneSet): number | null {
  if (fieldT === null || !(fieldT > 0) || !Number.isFinite(fieldT)) return null;
  return classifyField(fieldT, zoneSet).zoneIndex;
}

export interface RoomFieldSummary {
  stationCount: number;
  minFieldT: number | null;
  maxFieldT: number | null;
  /** The room's highest class: that of its highest |B| (null with no readings). */
  zoneIndex: number | null;
}

/** Field spread and highest class of a room from the fields of its stations (nulls skipped). */
export function summariseRoom(fieldsT: readonly (number | null)[], zoneSet: ZoneSet): RoomFieldSummary {
  let min = Infinity;
  let max = -Infinity;
  let count = 0;
  for (const f of fieldsT) {
    if (f === null || !(f > 0) || !Number.isFinite(f)) continue;
    count++;
    if (f < min) min = f;
    if (f > max) max = f;
  }
  if (count === 0) return { stationCount: fieldsT.length, minFieldT: null, maxFieldT: null, zoneIndex: null };
  return { stationCount: fieldsT.length, minFieldT: min, maxFieldT: max, zoneIndex: zoneIndexOf(max, zoneSet) };
}
