/**
 * Sync test fixtures: the demo's ids, read from the seeded database (not hard-coded), and the record and
 * mutation builders of sync-fixtures-core.ts.
 */
import { sql } from './api-helpers';

export * from './sync-fixtures-core';

export interface DemoIds {
  orgId: string;
  kestrelOrgId: string;
  openSurveyId: string;
  signedOffSurveyId: string;
  /** A level of the open survey's site. */
  levelId: string;
  /** A level of the Kestrel site (another organisation). */
  kestrelLevelId: string;
  gaussmeterId: string;
  /** relative_uncertainty of that gaussmeter (standard, per the instruments table). */
  gaussmeterRelativeUncertainty: number;
  users: { surveyor: string; surveyor2: string; reviewer: string; admin: string };
}

export async function readDemoIds(databaseUrl: string): Promise<DemoIds> {
  const one = async <T extends Record<string, unknown>>(text: string, values: unknown[] = []) => {
    const rows = await sql<T>(databaseUrl, text, values);
    if (!rows[0]) throw new Error(`no row for: ${text}`);
    return rows[0];
  };
  const org = await one<{ id: string }>(`SELECT id FROM organisations WHERE name ILIKE 'Harrowby%'`);
  const kestrel = await one<{ id: string }>(`SELECT id FROM organisations WHERE name ILIKE 'Kestrel%'`);
  const open = await one<{ id: string; site_id: string }>(`SELECT id, site_id FROM surveys WHERE organisation_id = $1 AND state = 'open' ORDER BY name LIMIT 1`, [org.id]);
  const signed = await one<{ id: string }>(`SELECT id FROM surveys WHERE organisation_id = $1 AND state = 'signed_off' ORDER BY signed_off_at DESC LIMIT 1`, [org.id]);
  const level = await one<{ id: string }>(`SELECT id FROM levels WHERE site_id = $1 ORDER BY ordinal LIMIT 1`, [open.site_id]);
  const kLevel = await one<{ id: string }>(`SELECT id FROM levels WHERE organisation_id = $1 LIMIT 1`, [kestrel.id]);
  const meter = await one<{ id: string; relative_uncertainty: number }>(
    `SELECT id, relative_uncertainty FROM instruments WHERE organisation_id = $1 AND kind = 'gaussmeter' AND relative_uncertainty IS NOT NULL ORDER BY serial LIMIT 1`,
    [org.id],
  );
  const user = async (email: string) => (await one<{ id: string }>(`SELECT id FROM users WHERE email = $1`, [email])).id;
  return {
    orgId: org.id,
    kestrelOrgId: kestrel.id,
    openSurveyId: open.id,
    signedOffSurveyId: signed.id,
    levelId: level.id,
    kestrelLevelId: kLevel.id,
    gaussmeterId: meter.id,
    gaussmeterRelativeUncertainty: meter.relative_uncertainty,
    users: {
      surveyor: await user('surveyor@harrowby.example'),
      surveyor2: await user('surveyor2@harrowby.example'),
      reviewer: await user('reviewer@harrowby.example'),
      admin: await user('admin@harrowby.example'),
    },
  };
}

