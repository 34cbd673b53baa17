/**
 * The home screen's lists: the counts the API reports for each site and survey agree with a direct
 * count in the database (a correlated subquery that compared a table with itself once reported 0 for
 * every site), and `assignedToMe` follows the survey assignments.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { demoEmail, signIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, type InProcessApp } from '../setup/test-app';

describe('site and survey lists', () => {
  let t: InProcessApp;
  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  });
  afterAll(async () => {
    await t?.close();
  });

  it('reports for every site the levels and sources the database holds', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    const orgId = admin.session.memberships[0]!.organisationId;
    const listed = await admin.agent.get(`/api/orgs/${orgId}/sites`).expect(200);
    // Per-user answers must never be kept by a browser or proxy cache.
    expect(listed.headers['cache-control']).toBe('no-store');
    const { sites } = listed.body as { sites: { id: string; levelCount: number; sourceCount: number }[] };
    expect(sites.length).toBeGreaterThan(0);
    for (const site of sites) {
      const levels = await t.pool.query<{ n: number }>('SELECT count(*)::int AS n FROM levels WHERE site_id = $1 AND NOT deleted', [site.id]);
      const sources = await t.pool.query<{ n: number }>('SELECT count(*)::int AS n FROM sources WHERE site_id = $1 AND NOT deleted', [site.id]);
      expect(levels.rows[0]!.n).toBeGreaterThan(0);
      expect(site.levelCount).toBe(levels.rows[0]!.n);
      expect(site.sourceCount).toBe(sources.rows[0]!.n);
      const one = (await admin.agent.get(`/api/orgs/${orgId}/sites/${site.id}`).expect(200)).body;
      expect(one.levelCount).toBe(site.levelCount);
    }
  });

  it('reports for every survey its stations and readings, and marks the surveys assigned to the caller', async () => {
    const surveyor = await signIn(t.app, demoEmail('surveyor'));
    const orgId = surveyor.session.memberships[0]!.organisationId;
    const { surveys } = (await surveyor.agent.get(`/api/orgs/${orgId}/surveys`).expect(200)).body as {
      surveys: { id: string; stationCount: number; readingCount: number; assignedToMe: boolean }[];
    };
    expect(surveys.length).toBeGreaterThan(1);
    for (const survey of surveys) {
      const stations = await t.pool.query<{ n: number }>('SELECT count(*)::int AS n FROM stations WHERE survey_id = $1 AND NOT deleted', [survey.id]);
      const readings = await t.pool.query<{ n: number }>('SELECT count(*)::int AS n FROM field_readings WHERE survey_id = $1 AND NOT deleted', [survey.id]);
      const assigned = await t.pool.query<{ n: number }>(
        'SELECT count(*)::int AS n FROM survey_assignments WHERE survey_id = $1 AND user_id = $2 AND NOT deleted',
        [survey.id, surveyor.session.user.id],
      );
      expect(survey.stationCount).toBe(stations.rows[0]!.n);
      expect(survey.readingCount).toBe(readings.rows[0]!.n);
      expect(survey.assignedToMe).toBe(assigned.rows[0]!.n > 0);
    }
  });
});
