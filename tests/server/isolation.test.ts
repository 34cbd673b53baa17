/**
 * Organisation isolation: a Kestrel admin (the most privileged role there) asking for Harrowby's
 * site, survey or user — by their real ids, under Kestrel's organisation id and under Harrowby's —
 * gets 404 in the error shape and a body that carries nothing of Harrowby.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { demoEmail, expectError, KESTREL_ADMIN, signIn, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

describe('organisation isolation', () => {
  let t: InProcessApp;
  let kestrel: SignedIn;
  let kestrelOrgId: string;
  const harrowby = { orgId: '', orgName: '', siteId: '', siteName: '', surveyId: '', surveyName: '', userId: '', userEmail: '', userName: '' };

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
    const admin = await signIn(t.app, demoEmail('admin'));
    const membership = admin.session.memberships[0]!;
    harrowby.orgId = membership.organisationId;
    harrowby.orgName = membership.organisationName;
    const site = (await admin.agent.get(`/api/orgs/${harrowby.orgId}/sites`).expect(200)).body.sites[0];
    const survey = (await admin.agent.get(`/api/orgs/${harrowby.orgId}/surveys`).expect(200)).body.surveys[0];
    const surveyor = await signIn(t.app, demoEmail('surveyor'));
    Object.assign(harrowby, {
      siteId: site.id,
      siteName: site.name,
      surveyId: survey.id,
      surveyName: survey.name,
      userId: surveyor.session.user.id,
      userEmail: surveyor.session.user.email,
      userName: surveyor.session.user.name,
    });
    kestrel = await signIn(t.app, KESTREL_ADMIN);
    expect(kestrel.session.memberships.map((m) => m.organisationId)).not.toContain(harrowby.orgId);
    kestrelOrgId = kestrel.session.memberships[0]!.organisationId;
  });
  afterAll(async () => {
    await t?.close();
  });

  const leaks = (body: unknown) => {
    const text = JSON.stringify(body);
    return [harrowby.orgName, harrowby.siteName, harrowby.surveyName, harrowby.userEmail, harrowby.userName, 'harrowby'].filter((s) => s && text.toLowerCase().includes(s.toLowerCase()));
  };

  const cases = () => [
    ['site', `sites/${harrowby.siteId}`],
    ['survey', `surveys/${harrowby.surveyId}`],
    ['user', `users/${harrowby.userId}`],
  ];

  it.each(['own', 'other'] as const)('answers 404 for Harrowby’s site, survey and user under the %s organisation id', async (which) => {
    const orgId = which === 'own' ? kestrelOrgId : harrowby.orgId;
    for (const [what, tail] of cases()) {
      const res = await kestrel.agent.get(`/api/orgs/${orgId}/${tail}`);
      expectError(res, 404, 'NOT_FOUND');
      expect(leaks(res.body), `${what} under ${which} org id`).toEqual([]);
    }
  });

  it('answers 404 for every other Harrowby list and write, and lists nothing of Harrowby under Kestrel', async () => {
    for (const tail of ['sites', 'surveys', 'members', 'invitations', 'audit']) {
      const res = await kestrel.agent.get(`/api/orgs/${harrowby.orgId}/${tail}`);
      expectError(res, 404, 'NOT_FOUND');
      expect(leaks(res.body)).toEqual([]);
    }
    const before = await t.pool.query('SELECT count(*)::int AS n FROM invitations');
    const write = await kestrel.agent.post(`/api/orgs/${harrowby.orgId}/invitations`).set('Origin', TRUSTED_ORIGIN).send({ email: 'spy@kestrel.example', role: 'admin' });
    expectError(write, 404, 'NOT_FOUND');
    expect((await t.pool.query('SELECT count(*)::int AS n FROM invitations')).rows[0].n).toBe(before.rows[0].n);

    for (const tail of ['sites', 'surveys', 'members', 'audit']) {
      const res = await kestrel.agent.get(`/api/orgs/${kestrelOrgId}/${tail}`).expect(200);
      expect(leaks(res.body), tail).toEqual([]);
    }
  });

  it('answers the same 404 for an organisation that does not exist', async () => {
    const res = await kestrel.agent.get('/api/orgs/00000000-0000-4000-8000-000000000000/sites');
    expectError(res, 404, 'NOT_FOUND');
    const real = await kestrel.agent.get(`/api/orgs/${harrowby.orgId}/sites`);
    expect(real.body).toEqual(res.body);
  });
});
