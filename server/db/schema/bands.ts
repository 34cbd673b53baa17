/**
 * What an organisation protects and against which thresholds: watch bands (frequency ranges that
 * predicted cyclotron lines must stay out of) and zone sets (the static-field lines that decide who may
 * go where, with the edition of the rule they follow — sites follow different editions, REFERENCES.md).
 */
import { sql } from 'drizzle-orm';
import { boolean, check, doublePrecision, index, jsonb, pgEnum, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import { SEVERITIES } from '../../../shared/schemas/vocabulary';
import { sites } from './sites';
import { finite, sameOrg, syncConstraints, syncedOrgColumns } from './synced';

export const severityEnum = pgEnum('severity', SEVERITIES);

export const watchBands = pgTable(
  'watch_bands',
  {
    ...syncedOrgColumns(),
    /** Set for a band that belongs to one site (an MRI scanner's receive band); null for organisation-wide. */
    siteId: uuid('site_id'),
    name: text('name').notNull(),
    lowerHz: doublePrecision('lower_hz').notNull(),
    upperHz: doublePrecision('upper_hz').notNull(),
    /** Why it is protected ("radio astronomy: H I line"). */
    reason: text('reason').notNull(),
    /** Where the edges come from (a published table, or "recalled from memory" until checked). */
    source: text('source').notNull(),
    severity: severityEnum('severity').notNull().default('medium'),
    /** Interference threshold at the receiver, dB(W/(m²·Hz)), when the source gives one. */
    thresholdDbWPerM2Hz: doublePrecision('threshold_db_w_per_m2_hz'),
    /** Offered from the starter set rather than typed by the organisation. */
    starter: boolean('starter').notNull().default(false),
    notes: text('notes'),
  },
  (t) => [
    ...syncConstraints('watch_bands', t),
    sameOrg('watch_bands_site_fk', t.siteId, t.organisationId, sites),
    check('watch_bands_edges_ck', sql`${t.lowerHz} >= 0 AND ${t.lowerHz} < ${t.upperHz} AND ${finite(t.upperHz)}`),
  ],
);

/** One line of a zone set: a name, the field in tesla, and the caution shown beside it. */
export interface ZoneThreshold {
  name: string;
  fieldT: number;
  caution: string;
}

export const zoneSets = pgTable(
  'zone_sets',
  {
    ...syncedOrgColumns(),
    name: text('name').notNull(),
    /** The rule and edition the thresholds follow ("IEC 60601-2-33:2022 (ed. 4)"). */
    edition: text('edition').notNull(),
    /** Ascending by fieldT; each a line a station is classed against. */
    thresholds: jsonb('thresholds').$type<ZoneThreshold[]>().notNull(),
    /** The organisation's default for new surveys. */
    isDefault: boolean('is_default').notNull().default(false),
    notes: text('notes'),
  },
  (t) => [
    ...syncConstraints('zone_sets', t),
    index('zone_sets_org_idx').on(t.organisationId),
    check('zone_sets_thresholds_ck', sql`jsonb_typeof(${t.thresholds}) = 'array' AND jsonb_array_length(${t.thresholds}) >= 1`),
    check('zone_sets_edition_ck', sql`length(trim(${t.edition})) > 0`),
  ],
);
