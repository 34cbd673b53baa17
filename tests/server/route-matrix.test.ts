/**
 * Every API route, once, with the status each role must get (and a signed-out caller). The test
 * walks the app's router stack: a route registered but missing here — or listed here but not
 * registered — fails the test, so a new route cannot ship without saying who may use it.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../shared/schemas/common';
import { seedDemo } from '../../server/db/seed/demo';
import { DEMO_PASSWORD, demoEmail, signIn, tokenFromLink, type SignedIn } from '../setup/api-helpers';
import { listRoutes } from '../setup/route-walk';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

type Who = Role | 'signedOut';
const WHO: readonly Who[] = [...ROLES, 'signedOut'];
type Statuses = Record<Who, number>;

const all = (status: number): Statuses => ({ admin: status, reviewer: status, emc: status, surveyor: status, viewer: status, signedOut: status });
const members = (status: number): Statuses => ({ ...all(status), signedOut: 401 });
const only = (allowed: Role[], status = 200): Statuses => ({
  ...Object.fromEntries(ROLES.map((r) => [r, allowed.includes(r) ? status : 403])),
  signedOut: 401,
}) as Statuses;

interface Context {
  orgId: string;
  siteId: string;
  surveyId: string;
  userId: string;
  token: string;
  newInvitationToken(): Promise<string>;
  unique(): string;
}

interface Row {
  method: 'GET' | 'POST';
  path: string;
  expect: Statuses;
  /** Per-call body and/or parameter overrides. */
  prepare?: (ctx: Context, who: Who) => Promise<{ body?: unknown; params?: Record<string, string> }> | { body?: unknown; params?: Record<string, string> };
  /** The call ends or replaces the session: give it a session of its own. */
  fresh?: boolean;
}

const MATRIX: Row[] = [
  { method: 'GET', path: '/api/health', expect: all(200) },
  {
    method: 'POST',
    path: '/api/auth/sign-in',
    expect: all(200),
    fresh: true,
    prepare: (_ctx, who) => ({ body: { email: demoEmail(who === 'signedOut' ? 'viewer' : who), password: DEMO_PASSWORD } }),
  },
  { method: 'POST', path: '/api/auth/sign-out', expect: all(204), fresh: true },
  { method: 'GET', path: '/api/auth/session', expect: members(200) },
  { method: 'POST', path: '/api/auth/password-reset/request', expect: all(202), prepare: (ctx) => ({ body: { email: `${ctx.unique()}@nowhere.example` } }) },
  // A made-up token: reachable by anyone (no 401), refused for the token.
  { method: 'POST', path: '/api/auth/password-reset/confirm', expect: all(400), prepare: () => ({ body: { token: 'x'.repeat(43), password: 'a-long-new-password' } }) },
  { method: 'GET', path: '/api/invitations/:token', expect: all(200) },
  {
    method: 'POST',
    path: '/api/invitations/:token/accept',
    expect: all(200),
    fresh: true,
    prepare: async (ctx) => ({ params: { token: await ctx.newInvitationToken() }, body: { name: 'Matrix Person', password: 'a-long-new-password' } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/members', expect: only(['admin', 'reviewer']) },
  { method: 'GET', path: '/api/orgs/:orgId/users/:userId', expect: only(['admin', 'reviewer']) },
  {
    method: 'POST',
    path: '/api/orgs/:orgId/invitations',
    expect: only(['admin'], 201),
    prepare: (ctx) => ({ body: { email: `${ctx.unique()}@harrowby.example`, role: 'viewer' } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/invitations', expect: only(['admin']) },
  { method: 'GET', path: '/api/orgs/:orgId/sites', expect: members(200) },
  { method: 'GET', path: '/api/orgs/:orgId/sites/:siteId', expect: members(200) },
  { method: 'GET', path: '/api/orgs/:orgId/surveys', expect: members(200) },
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId', expect: members(200) },
  { method: 'GET', path: '/api/orgs/:orgId/audit', expect: only(['admin']) },
  // Admin of any organisation, and only while the local mail capture runs (it does in tests).
  { method: 'GET', path: '/api/dev/mail', expect: only(['admin']) },
];

describe('role × route matrix', () => {
  let t: InProcessApp;
  let ctx: Context;
  const sessions = new Map<Role, SignedIn>();
  let counter = 0;

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
    for (const role of ROLES) sessions.set(role, await signIn(t.app, demoEmail(role)));
    const admin = sessions.get('admin')!;
    const orgId = admin.session.memberships[0]!.organisationId;
    const sites = await admin.agent.get(`/api/orgs/${orgId}/sites`).expect(200);
    const surveys = await admin.agent.get(`/api/orgs/${orgId}/surveys`).expect(200);
    const unique = () => `matrix-${Date.now()}-${(counter += 1)}`;
    const newInvitationToken = async () => {
      const email = `${unique()}@harrowby.example`;
      await admin.agent.post(`/api/orgs/${orgId}/invitations`).set('Origin', TRUSTED_ORIGIN).send({ email, role: 'viewer' }).expect(201);
      return tokenFromLink((await t.capture.waitFor((m) => m.to.includes(email))).text, /\/invitations\/([A-Za-z0-9_-]{43})/);
    };
    ctx = {
      orgId,
      siteId: sites.body.sites[0].id,
      surveyId: surveys.body.surveys[0].id,
      userId: sessions.get('viewer')!.session.user.id,
      token: await newInvitationToken(),
      newInvitationToken,
      unique,
    };
  });
  afterAll(async () => {
    await t?.close();
  });

  it('lists every registered route exactly once', () => {
    const registered = listRoutes(t.app).filter((r) => r.split(' ')[1]!.startsWith('/api'));
    const listed = MATRIX.map((r) => `${r.method} ${r.path}`);
    expect(new Set(listed).size, 'a route is listed twice').toBe(listed.length);
    expect(registered.filter((r) => !listed.includes(r)), 'registered routes missing from the matrix').toEqual([]);
    expect(listed.filter((r) => !registered.includes(r)), 'matrix rows with no such route').toEqual([]);
  });

  it.each(MATRIX.map((row) => [`${row.method} ${row.path}`, row] as const))('%s answers each role as listed', async (_name, row) => {
    const got: Partial<Statuses> = {};
    for (const who of WHO) {
      const prepared = (await row.prepare?.(ctx, who)) ?? {};
      const params: Record<string, string> = { orgId: ctx.orgId, siteId: ctx.siteId, surveyId: ctx.surveyId, userId: ctx.userId, token: ctx.token, ...prepared.params };
      const url = row.path.replace(/:(\w+)/g, (_m, name: string) => {
        const value = params[name];
        if (!value) throw new Error(`no value for :${name}`);
        return encodeURIComponent(value);
      });
      let cookie: string | undefined;
      if (who !== 'signedOut') cookie = row.fresh ? (await signIn(t.app, demoEmail(who))).cookie : sessions.get(who)!.cookie;
      let req = row.method === 'GET' ? request(t.app).get(url) : request(t.app).post(url).set('Origin', TRUSTED_ORIGIN);
      if (cookie) req = req.set('Cookie', cookie);
      const res = row.method === 'POST' ? await req.send((prepared.body ?? {}) as object) : await req;
      got[who] = res.status;
      if (res.status >= 400) expect(res.body?.error?.code, `${who}: ${JSON.stringify(res.body)}`).toMatch(/^[A-Z_]+$/);
    }
    expect(got).toEqual(row.expect);
  });
});
