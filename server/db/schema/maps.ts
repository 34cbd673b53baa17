/**
 * Survey maps (issue 7 §1): the computed map of a survey — merged stations, classes, interpolated grids,
 * isogauss contours, repeat groups, dipole fits — kept per survey and variant (the extra contour levels
 * asked for) together with the data version it was made from: the highest change sequence of everything
 * it reads (the survey, its stations, readings and decisions, its zone set, the site's levels, plans,
 * rooms and magnets, the organisation's instruments, the survey's flags). Any write to those takes a new
 * change sequence, so a stored map whose version is not the current one is simply recomputed.
 *
 * A cache, not a record: derived from synced rows, never synced, never audited; rows may be dropped at
 * any time. The payload is the JSON answer as text, sent as it is stored.
 */
import { bigint, integer, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { organisations } from './organisations';
import { surveys } from './surveys';

export const surveyMapCache = pgTable(
  'survey_map_cache',
  {
    surveyId: uuid('survey_id')
      .notNull()
      .references(() => surveys.id, { onDelete: 'cascade' }),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisations.id, { onDelete: 'cascade' }),
    /** What was asked beyond the survey itself (computation version, extra levels). */
    variant: text('variant').notNull(),
    dataVersion: bigint('data_version', { mode: 'number' }).notNull(),
    payload: text('payload').notNull(),
    computeMs: integer('compute_ms').notNull(),
    computedAt: timestamp('computed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.surveyId, t.variant] })],
);
