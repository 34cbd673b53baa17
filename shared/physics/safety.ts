/**
 * Static-field safety classes: |B| against an ordered, configurable set of thresholds ("zone set").
 *
 * A field AT or above a threshold is inside that threshold's zone (the conservative reading of "exceeds"
 * at a boundary). Every default threshold carries its source, a caution, and whether its value was
 * recalled rather than read in the primary text (`recalled: true` — whoever can read the document
 * should confirm it). Thresholds differ by jurisdiction, by implant and by edition of a standard; the
 * tool supports, and does not replace, the site's MR safety officer, radiation-protection adviser and
 * licensed practice. Follow local codes.
 */

import { z } from 'zod';
import { PhysicsInputError } from './errors';
import { requireFieldTesla } from './kinematics';

/** One threshold of a zone set. */
export interface ZoneThreshold {
  readonly id: string;
  /** Short label of the zone at and above this threshold, e.g. "Implant action level". */
  readonly label: string;
  readonly thresholdTesla: number;
  /** Document (and clause/edition) the value comes from. */
  readonly source: string;
  /** Caution shown next to this zone. */
  readonly caution: string;
  /** True when the value is widely quoted but was not read in the primary document here. */
  readonly recalled: boolean;
}

/** An ordered set of thresholds (strictly ascending), naming the document and edition it follows. */
export interface ZoneSet {
  readonly id: string;
  readonly name: string;
  /** Document and edition the set follows, e.g. "IEC 60601-2-33 edition 4 (2022)". */
  readonly follows: string;
  /** Label for fields below the lowest threshold. */
  readonly belowLabel: string;
  readonly thresholds: readonly ZoneThreshold[];
}

/** Cautions every safety display shows, whatever the zone set (DESIGN.md §6; ICNIRP 2009; 2013/35/EU). */
export const GENERAL_SAFETY_CAUTIONS: readonly string[] = Object.freeze([
  'Thresholds differ by jurisdiction, by implant and by edition of a standard: follow local codes.',
  "This tool supports, and does not replace, the site's MR safety officer, radiation-protection adviser and licensed practice.",
  'The limits do not protect wearers of active or ferromagnetic implants; such people may need far lower levels.',
  'Projectile force grows with B·dB/dz and is steepest near shielded magnets.',
  'Movement in fields above about 2 T can cause vertigo and nausea.',
  'Levels are spatial peaks, not averages. Surveys near strong magnets use non-magnetic tools only.',
]);

const EU_SOURCE = 'Directive 2013/35/EU, Annex II (OJ L 179/1, 29.6.2013)';

/** EU directive 2013/35/EU: action levels 0.5 mT and 3 mT, exposure limit values 2 T and 8 T (recalled). */
export const EU_2013_35_ZONE_SET: ZoneSet = Object.freeze({
  id: 'eu-2013-35',
  name: 'EU directive 2013/35/EU (static magnetic field)',
  follows: 'Directive 2013/35/EU of 26 June 2013',
  belowLabel: 'Below the implant action level',
  thresholds: Object.freeze([
    {
      id: 'eu-al-implants',
      label: 'Action level: active implanted devices',
      thresholdTesla: 0.5e-3,
      source: `${EU_SOURCE}, action level for interference with active implanted devices`,
      caution: 'Keep people with pacemakers or other active implants out unless their device is cleared for this field.',
      recalled: true,
    },
    {
      id: 'eu-al-projectile',
      label: 'Action level: attraction and projectile risk',
      thresholdTesla: 3e-3,
      source: `${EU_SOURCE}, action level for attraction and projectile risk in the fringe field of sources above 100 mT`,
      caution: 'Ferromagnetic objects can become projectiles; control what is carried in.',
      recalled: true,
    },
    {
      id: 'eu-elv-normal',
      label: 'Exposure limit value: normal working conditions',
      thresholdTesla: 2,
      source: `${EU_SOURCE}, exposure limit value for normal working conditions`,
      caution: 'Above the limit for normal working conditions: controlled conditions and training required.',
      recalled: true,
    },
    {
      id: 'eu-elv-controlled',
      label: 'Exposure limit value: controlled conditions / limbs',
      thresholdTesla: 8,
      source: `${EU_SOURCE}, exposure limit value for controlled working conditions and localised limb exposure`,
      caution: 'Above every exposure limit value of the directive.',
      recalled: true,
    },
  ]),
});

const ICNIRP_SOURCE = 'ICNIRP 2009, Guidelines on limits of exposure to static magnetic fields, Health Physics 96(4):504–514';

/** ICNIRP 2009 static-field limits: implants "such as 0.5 mT", public 400 mT, occupational 2 T and 8 T (recalled). */
export const ICNIRP_2009_ZONE_SET: ZoneSet = Object.freeze({
  id: 'icnirp-2009',
  name: 'ICNIRP 2009 static magnetic field guidelines',
  follows: 'ICNIRP 2009 (Health Physics 96(4):504–514)',
  belowLabel: 'Below the implant advisory level',
  thresholds: Object.freeze([
    {
      id: 'icnirp-implants',
      label: 'Implant advisory level',
      thresholdTesla: 0.5e-3,
      source: `${ICNIRP_SOURCE}: people with implants may need levels "such as 0.5 mT"`,
      caution: 'People with implanted medical devices or ferromagnetic implants may need far lower levels.',
      recalled: true,
    },
    {
      id: 'icnirp-public',
      label: 'Public exposure limit',
      thresholdTesla: 0.4,
      source: `${ICNIRP_SOURCE}: general public, any part of the body, 400 mT`,
      caution: 'Above the public exposure limit: occupational access only.',
      recalled: true,
    },
    {
      id: 'icnirp-occupational-head',
      label: 'Occupational limit: head and trunk',
      thresholdTesla: 2,
      source: `${ICNIRP_SOURCE}: occupational, head and trunk, 2 T`,
      caution: 'Above the occupational limit for head and trunk.',
      recalled: true,
    },
    {
      id: 'icnirp-occupational-limbs',
      label: 'Occupational limit: limbs',
      thresholdTesla: 8,
      source: `${ICNIRP_SOURCE}: occupational, limbs, 8 T`,
      caution: 'Above every ICNIRP 2009 static-field limit.',
      recalled: true,
    },
  ]),
});

/** IEC 60601-2-33 up to its 2015 edition (ed. 3 with amendments): controlled-access boundary 0.5 mT (recalled). */
export const IEC_60601_2_33_ED3_ZONE_SET: ZoneSet = Object.freeze({
  id: 'iec-60601-2-33-ed3',
  name: 'IEC 60601-2-33 controlled access area (up to the 2015 edition)',
  follows: 'IEC 60601-2-33 edition 3 (2010) with amendments to 2015',
  belowLabel: 'Outside the controlled access area',
  thresholds: Object.freeze([
    {
      id: 'iec-ed3-controlled-access',
      label: 'Controlled access area',
      thresholdTesla: 0.5e-3,
      source: 'IEC 60601-2-33 ed. 3 (2010) + A1:2013 + A2:2015, controlled access area boundary 0.5 mT',
      caution: 'Inside the MR controlled access area: screening required before entry.',
      recalled: true,
    },
  ]),
});

/** IEC 60601-2-33 edition 4 (2022): B0 hazard boundary moved to 0.9 mT (recalled). */
export const IEC_60601_2_33_ED4_ZONE_SET: ZoneSet = Object.freeze({
  id: 'iec-60601-2-33-ed4',
  name: 'IEC 60601-2-33 B0 hazard boundary (edition 4, 2022)',
  follows: 'IEC 60601-2-33 edition 4 (2022)',
  belowLabel: 'Outside the B0 hazard area',
  thresholds: Object.freeze([
    {
      id: 'iec-ed4-b0-hazard',
      label: 'B0 hazard area',
      thresholdTesla: 0.9e-3,
      source: 'IEC 60601-2-33 ed. 4 (2022), static field (B0) hazard boundary 0.9 mT',
      caution: 'Inside the MR static-field hazard area: screening required before entry. Sites on earlier editions use 0.5 mT.',
      recalled: true,
    },
  ]),
});

/** Equipment disturbance levels (common practice, e.g. National Research Council, Prudent Practices in the Laboratory (2011), table 7.1; recalled). */
export const EQUIPMENT_DISTURBANCE_ZONE_SET: ZoneSet = Object.freeze({
  id: 'equipment-common-practice',
  name: 'Equipment disturbance (common practice)',
  follows: 'National Research Council, Prudent Practices in the Laboratory (2011), table 7.1',
  belowLabel: 'Below equipment disturbance levels',
  thresholds: Object.freeze([
    {
      id: 'equipment-sensitive',
      label: 'Electron microscopes and nuclear cameras disturbed',
      thresholdTesla: 0.1e-3,
      source: 'Prudent Practices in the Laboratory (2011), table 7.1: about 0.1 mT (common practice)',
      caution: 'Sensitive instruments (electron microscopes, gamma cameras, CRTs) may be disturbed.',
      recalled: true,
    },
    {
      id: 'equipment-cards-watches',
      label: 'Magnetic cards and watches damaged',
      thresholdTesla: 1e-3,
      source: 'Prudent Practices in the Laboratory (2011), table 7.1: about 1 mT (common practice)',
      caution: 'Magnetic-stripe cards and mechanical watches may be damaged.',
      recalled: true,
    },
  ]),
});

/** The default zone sets, by id. */
export const DEFAULT_ZONE_SETS: readonly ZoneSet[] = Object.freeze([
  EU_2013_35_ZONE_SET,
  ICNIRP_2009_ZONE_SET,
  IEC_60601_2_33_ED3_ZONE_SET,
  IEC_60601_2_33_ED4_ZONE_SET,
  EQUIPMENT_DISTURBANCE_ZONE_SET,
]);

/** zod schema of a configurable zone set: thresholds finite, > 0, strictly ascending, unique ids. */
export const ZoneSetSchema = z
  .object({
    id: z.string().trim().min(1).max(64),
    name: z.string().trim().min(1).max(200),
    follows: z.string().trim().min(1, 'Say which document and edition this zone set follows.').max(300),
    belowLabel: z.string().trim().min(1).max(200),
    thresholds: z
      .array(
        z.object({
          id: z.string().trim().min(1).max(64),
          label: z.string().trim().min(1).max(200),
          thresholdTesla: z.number().positive().finite().max(100),
          source: z.string().trim().min(1, 'Every threshold needs a source.').max(500),
          caution: z.string().trim().min(1, 'Every threshold needs a caution.').max(500),
          recalled: z.boolean(),
        }),
      )
      .min(1, 'A zone set needs at least one threshold.')
      .max(32),
  })
  .superRefine((set, ctx) => {
    const ids = new Set<string>();
    set.thresholds.forEach((t, i) => {
      if (ids.has(t.id)) ctx.addIssue({ code: 'custom', message: `Duplicate threshold id "${t.id}".`, path: ['thresholds', i, 'id'] });
      ids.add(t.id);
      const prev = set.thresholds[i - 1];
      if (prev && !(t.thresholdTesla > prev.thresholdTesla)) {
        ctx.addIssue({
          code: 'custom',
          message: 'Thresholds must be in strictly ascending order.',
          path: ['thresholds', i, 'thresholdTesla'],
        });
      }
    });
  });

/** Validates a configurable zone set ({@link ZoneSetSchema}); throws INVALID_INPUT with the first problem. */
export function createZoneSet(input: unknown): ZoneSet {
  const parsed = ZoneSetSchema.safeParse(input);
  if (!parsed.success) {
    const first = parsed.error.issues[0];
    throw new PhysicsInputError('INVALID_INPUT', `Zone set is not valid: ${first?.message ?? 'invalid input'}`, {
      field: first?.path.join('.') || 'zoneSet',
      value: input,
    });
  }
  validatedSets.add(parsed.data);
  return parsed.data;
}

/** Zone sets already validated (the defaults, and anything returned by createZoneSet). */
const validatedSets = new WeakSet<object>();

function validatedZoneSet(zoneSet: ZoneSet): ZoneSet {
  if (typeof zoneSet === 'object' && zoneSet !== null && validatedSets.has(zoneSet)) return zoneSet;
  const set = createZoneSet(zoneSet);
  validatedSets.add(zoneSet);
  validatedSets.add(set);
  return set;
}

/** Result of {@link classifyField}. */
export interface SafetyClassification {
  readonly zoneSetId: string;
  readonly follows: string;
  /** Index of the highest threshold reached (−1: below all). */
  readonly zoneIndex: number;
  /** The highest threshold reached, or null. */
  readonly threshold: ZoneThreshold | null;
  readonly label: string;
  /** The next threshold above the field, or null if the field is above all. */
  readonly nextThreshold: ZoneThreshold | null;
  /** Field over the next threshold (0..1), or null. */
  readonly fractionOfNext: number | null;
  /** Cautions: the zone's own caution (if any) then the general ones. */
  readonly cautions: readonly string[];
}

/**
 * Classifies |B| against a zone set: the zone is that of the highest threshold with |B| ≥ threshold.
 * Thresholds and their sources: see the default sets above.
 */
export function classifyField(fieldTesla: number, zoneSet: ZoneSet): SafetyClassification {
  requireFieldTesla(fieldTesla);
  const set = validatedZoneSet(zoneSet);
  let zoneIndex = -1;
  for (let i = 0; i < set.thresholds.length; i++) {
    if (fieldTesla >= (set.thresholds[i] as ZoneThreshold).thresholdTesla) zoneIndex = i;
  }
  const threshold = zoneIndex >= 0 ? (set.thresholds[zoneIndex] as ZoneThreshold) : null;
  const nextThreshold = set.thresholds[zoneIndex + 1] ?? null;
  return {
    zoneSetId: set.id,
    follows: set.follows,
    zoneIndex,
    threshold,
    label: threshold ? threshold.label : set.belowLabel,
    nextThreshold,
    fractionOfNext: nextThreshold ? fieldTesla / nextThreshold.thresholdTesla : null,
    cautions: threshold ? [threshold.caution, ...GENERAL_SAFETY_CAUTIONS] : [...GENERAL_SAFETY_CAUTIONS],
  };
}
