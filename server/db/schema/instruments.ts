/**
 * Gaussmeters, spectrum analysers and antennas. Each reading names the instrument that produced it, so
 * a report can prove which instrument — and which calibration — stands behind every number.
 */
import { sql } from 'drizzle-orm';
import { boolean, check, date, doublePrecision, index, pgEnum, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { INSTRUMENT_KINDS } from '../../../shared/schemas/vocabulary';
import { finite, syncConstraints, syncedOrgColumns } from './synced';

export const instrumentKindEnum = pgEnum('instrument_kind', INSTRUMENT_KINDS);

export const instruments = pgTable(
  'instruments',
  {
    ...syncedOrgColumns(),
    kind: instrumentKindEnum('kind').notNull(),
    /** Make and model as printed on the instrument. */
    model: text('model').notNull(),
    serial: text('serial').notNull(),
    /** For gaussmeters: probe type ("3-axis Hall", "fluxgate"). */
    probe: text('probe'),
    /** Date of the last calibration and the date it falls due (calendar dates, no time of day). */
    calibratedOn: date('calibrated_on', { mode: 'string' }),
    calibrationDueOn: date('calibration_due_on', { mode: 'string' }),
    calibrationCertificate: text('calibration_certificate'),
    /**
     * Relative standard uncertainty of a reading (0.01 = 1 %): for gaussmeters the field, for analysers
     * the frequency. Antennas carry an antenna-factor table instead.
     */
    relativeUncertainty: doublePrecision('relative_uncertainty'),
    /** Object-store key of an antenna's antenna-factor CSV (issue 6 §7). */
    antennaFactorObjectKey: text('antenna_factor_object_key'),
    archived: boolean('archived').notNull().default(false),
    notes: text('notes'),
  },
  (t) => [
    ...syncConstraints('instruments', t),
    index('instruments_org_idx').on(t.organisationId, t.kind),
    // One live record per physical instrument; a tombstoned duplicate does not block re-entry.
    uniqueIndex('instruments_serial_uq').on(t.organisationId, t.kind, t.model, t.serial).where(sql`${t.deleted} = false`),
    check('instruments_serial_ck', sql`length(trim(${t.serial})) > 0`),
    check(
      'instruments_uncertainty_ck',
      sql`${t.relativeUncertainty} IS NULL OR (${t.relativeUncertainty} >= 0 AND ${t.relativeUncertainty} < 1 AND ${finite(t.relativeUncertainty)})`,
    ),
    check(
      'instruments_calibration_ck',
      sql`${t.calibratedOn} IS NULL OR ${t.calibrationDueOn} IS NULL OR ${t.calibratedOn} <= ${t.calibrationDueOn}`,
    ),
  ],
);
