/**
 * Bad input never reaches the database and never causes a 500: malformed JSON, wrong types, missing
 * fields, oversized bodies and malformed ids all get a 4xx in the one error shape, and no row is
 * written. Plus the CSRF Origin check, the security headers and the session cookie's flags.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { seedDemo } from '../../server/db/seed/demo';
import { createMailer } from '../../server/lib/mail';
import { countRows, demoEmail, expectError, signIn, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, TEST_SESSION_SECRET, testLogger, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

const TABLES = ['users', 'memberships', 'invitations', 'password_reset_tokens', 'audit_log', 'session', 'organisations'];

describe('bad input', () => {
  let t: InProcessApp;
  let admin: SignedIn;
  let orgId: string;

  const counts = async () => Object.fromEntries(await Promise.all(TABLES.map(async (table) => [table, await countRows(t.databaseUrl, table)] as const)));

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
    admin = await signIn(t.app, demoEmail('admin'));
    orgId = admin.session.memberships[0]!.organisationId;
  });
  afterAll(async () => {
    await t?.close();
  });

  const post = (path: string) => admin.agent.post(path).set('Origin', TRUSTED_ORIGIN);

  it('refuses malformed JSON with 400 MALFORMED_JSON', async () => {
    const before = await counts();
    for (const path of ['/api/auth/sign-in', `/api/orgs/${orgId}/invitations`, '/api/auth/password-reset/request']) {
      const res = await post(path).set('Content-Type', 'application/json').send('{"email": "a@b.example",');
      expectError(res, 400, 'MALFORMED_JSON');
    }
    expect(await counts()).toEqual(before);
  });

  it('refuses wrong types and missing fields with 400 VALIDATION_FAILED naming the fields', async () => {
    const before = await counts();
    const wrongTypes = await post(`/api/orgs/${orgId}/invitations`).send({ email: 42, role: ['admin'] });
    expectError(wrongTypes, 400, 'VALIDATION_FAILED');
    const paths = wrongTypes.body.error.details.issues.map((i: { in: string; path: string }) => `${i.in}.${i.path}`);
    expect(paths).toEqual(expect.arrayContaining(['body.email', 'body.role']));

    const missing = await post('/api/auth/sign-in').send({});
    expectError(missing, 400, 'VALIDATION_FAILED');
    expect(missing.body.error.details.issues.map((i: { path: string }) => i.path)).toEqual(expect.arrayContaining(['email', 'password']));

    expectError(await post(`/api/orgs/${orgId}/invitations`).send({ email: 'ok@harrowby.example', role: 'superuser' }), 400, 'VALIDATION_FAILED');
    expectError(await post('/api/auth/sign-in').send([1, 2, 3]), 400, 'VALIDATION_FAILED');
    expectError(await post('/api/auth/sign-in').send('null').set('Content-Type', 'application/json'), 400);
    // A body that is not JSON at all is no body: the fields are missing.
    expectError(await post('/api/auth/sign-in').set('Content-Type', 'text/plain').send('email=a@b.example'), 400, 'VALIDATION_FAILED');
    expectError(await post('/api/auth/password-reset/confirm').send({ token: 'short', password: 'x' }), 400, 'VALIDATION_FAILED');
    expectError(await post('/api/invitations/too-short/accept').send({ name: 'A', password: 'a-long-password' }), 400, 'VALIDATION_FAILED');
    expectError(await admin.agent.get(`/api/orgs/${orgId}/audit?limit=lots`), 400, 'VALIDATION_FAILED');
    expectError(await admin.agent.get(`/api/orgs/${orgId}/audit?limit=100000`), 400, 'VALIDATION_FAILED');
    expect(await counts()).toEqual(before);
  });

  it('refuses a body over the 1 MB limit with 413 PAYLOAD_TOO_LARGE', async () => {
    const before = await counts();
    const huge = { email: 'big@harrowby.example', role: 'viewer', padding: 'x'.repeat(1_100_000) };
    expectError(await post(`/api/orgs/${orgId}/invitations`).send(huge), 413, 'PAYLOAD_TOO_LARGE');
    expectError(await post('/api/auth/sign-in').send({ email: 'big@harrowby.example', password: 'y'.repeat(2_000_000) }), 413, 'PAYLOAD_TOO_LARGE');
    expect(await counts()).toEqual(before);
  });

  it('refuses ids that are not UUIDs with 400, and unknown API routes with a JSON 404', async () => {
    for (const path of ['/api/orgs/not-a-uuid/sites', `/api/orgs/${orgId}/sites/12345`, `/api/orgs/${orgId}/surveys/%27%3B%20DROP%20TABLE%20surveys`, `/api/orgs/${orgId}/users/../members`]) {
      const res = await admin.agent.get(path);
      expect(res.status, path).toBeGreaterThanOrEqual(400);
      expect(res.status, path).toBeLessThan(500);
      expectError(res, res.status);
    }
    expectError(await admin.agent.get('/api/orgs/not-a-uuid/sites'), 400, 'VALIDATION_FAILED');
    expectError(await admin.agent.get(`/api/orgs/${orgId}/sites/12345`), 400, 'VALIDATION_FAILED');
    expectError(await admin.agent.get('/api/no/such/route'), 404, 'NOT_FOUND');
    expectError(await post('/api/no/such/route').send({}), 404, 'NOT_FOUND');
  });

  it('never answers 500 to garbage on any write route', async () => {
    const before = await counts();
    const routes = ['/api/auth/sign-in', '/api/auth/password-reset/request', '/api/auth/password-reset/confirm', `/api/orgs/${orgId}/invitations`, `/api/invitations/${'a'.repeat(43)}/accept`];
    const garbage: [string, string][] = [
      ['application/json', '{"email": {"$gt": ""}, "password": {"toString": 1}}'],
      ['application/json', '"just a string"'],
      ['application/json', '{"email": "\u0000@x.example", "password": "\u0000"}'],
      ['application/json', `{"email": "${'a'.repeat(300)}@x.example", "password": "${'p'.repeat(300)}", "role": null, "name": 7}`],
      ['application/json; charset=utf-16', '{"email": "a@b.example"}'],
      ['application/x-www-form-urlencoded', 'email=a%40b.example&password=x'],
      ['application/json', '{"__proto__": {"admin": true}, "constructor": {"prototype": {}}}'],
    ];
    for (const route of routes) {
      for (const [type, body] of garbage) {
        const res = await post(route).set('Content-Type', type).send(body);
        expect(res.status, `${route} ${type} ${body.slice(0, 40)}`).toBeGreaterThanOrEqual(400);
        expect(res.status, `${route} ${type} ${body.slice(0, 40)}`).toBeLessThan(500);
        expectError(res, res.status);
      }
    }
    expect(await counts()).toEqual(before);
  });
});

describe('CSRF, security headers and cookie flags', () => {
  let t: InProcessApp;
  let admin: SignedIn;
  let orgId: string;

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
    admin = await signIn(t.app, demoEmail('admin'));
    orgId = admin.session.memberships[0]!.organisationId;
  });
  afterAll(async () => {
    await t?.close();
  });

  const invite = (email: string) => admin.agent.post(`/api/orgs/${orgId}/invitations`).send({ email, role: 'viewer' });

  it('refuses a cookie-carrying write with a foreign Origin, or with no Origin and no Referer: 403 CSRF_ORIGIN_MISMATCH', async () => {
    const before = await countRows(t.databaseUrl, 'invitations');
    expectError(await invite('a@harrowby.example').set('Origin', 'https://evil.example'), 403, 'CSRF_ORIGIN_MISMATCH');
    expectError(await invite('b@harrowby.example').set('Origin', 'null'), 403, 'CSRF_ORIGIN_MISMATCH');
    expectError(await invite('c@harrowby.example'), 403, 'CSRF_ORIGIN_MISMATCH');
    expectError(await invite('d@harrowby.example').set('Referer', 'https://evil.example/page'), 403, 'CSRF_ORIGIN_MISMATCH');
    // Same host, other port: a different origin.
    expectError(await invite('e@harrowby.example').set('Origin', 'http://127.0.0.1:5999'), 403, 'CSRF_ORIGIN_MISMATCH');
    expectError(await admin.agent.post('/api/auth/sign-out').set('Origin', 'https://evil.example'), 403, 'CSRF_ORIGIN_MISMATCH');
    expect(await countRows(t.databaseUrl, 'invitations')).toBe(before);
    // Still signed in: the refused sign-out did nothing.
    await admin.agent.get('/api/auth/session').expect(200);

    // The app's own origin passes, by Origin or (when a browser omits it) by Referer.
    await invite('f@harrowby.example').set('Origin', TRUSTED_ORIGIN).expect(201);
    await invite('g@harrowby.example').set('Referer', `${TRUSTED_ORIGIN}/members`).expect(201);
    expect(await countRows(t.databaseUrl, 'invitations')).toBe(before + 2);
  });

  it('sends helmet’s security headers with a CSP limited to the app’s own origin', async () => {
    const res = await request(t.app).get('/api/health').expect(200);
    const csp = String(res.headers['content-security-policy']);
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain("script-src 'self' 'unsafe-inline'");
    expect(csp).toContain("img-src 'self' data: blob:");
    expect(csp).toContain("worker-src 'self'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['referrer-policy']).toBe('no-referrer');
    expect(res.headers['cross-origin-opener-policy']).toBe('same-origin');
    expect(res.headers['x-powered-by']).toBeUndefined();
    // Over plain http (127.0.0.1) no HSTS: it would be meaningless.
    expect(res.headers['strict-transport-security']).toBeUndefined();
  });

  it('sets the session cookie httpOnly and SameSite=Lax', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').set('Origin', TRUSTED_ORIGIN).send({ email: demoEmail('viewer'), password: 'fringewalk-demo' }).expect(200);
    const line = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('fw.sid='))!;
    expect(line).toMatch(/; HttpOnly/i);
    expect(line).toMatch(/; SameSite=Lax/i);
    expect(line).toMatch(/; Path=\//);
  });

  it('marks the cookie Secure when the public URL is https (behind a TLS-terminating proxy)', async () => {
    const mailer = createMailer({ smtpUrl: t.capture.url, from: 'test@fringewalk.invalid' });
    const https = createApp({
      db: t.db,
      pool: t.pool,
      logger: testLogger(),
      mailer,
      publicUrl: 'https://fringewalk.example',
      trustedOrigins: [],
      sessionSecret: TEST_SESSION_SECRET,
      trustProxy: 'loopback',
      rateLimits: RELAXED_RATE_LIMITS,
    });
    try {
      const res = await request(https.app)
        .post('/api/auth/sign-in')
        .set('Origin', 'https://fringewalk.example')
        .set('X-Forwarded-Proto', 'https')
        .send({ email: demoEmail('viewer'), password: 'fringewalk-demo' })
        .expect(200);
      const line = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('fw.sid='))!;
      expect(line).toMatch(/; Secure/i);
      expect(line).toMatch(/; HttpOnly/i);
      expect(String(res.headers['strict-transport-security'])).toMatch(/max-age=\d+/);
      // The http origin is not trusted by an https deployment.
      expectError(await request(https.app).post('/api/auth/sign-out').set('Origin', TRUSTED_ORIGIN), 403, 'CSRF_ORIGIN_MISMATCH');
    } finally {
      await https.close();
      mailer.close();
    }
  });
});
