/**
 * Sign-in, sign-out, rate limiting, invitations and password reset, end to end against the real
 * PostgreSQL, with every e-mail delivered by nodemailer over SMTP to the local capture and read back.
 */
import { createHash } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InvitationPreviewSchema, SessionSchema } from '../../shared/schemas/auth';
import { AuditListSchema } from '../../shared/schemas/audit';
import { InvitationSchema } from '../../shared/schemas/invitation';
import { seedDemo } from '../../server/db/seed/demo';
import { countRows, DEMO_PASSWORD, demoEmail, expectError, KESTREL_ADMIN, sessionCookie, signIn, sql, tokenFromLink } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

const INVITE_LINK = /\/invitations\/([A-Za-z0-9_-]{43})\b/;
const RESET_LINK = /\/reset-password\?token=([A-Za-z0-9_%-]{43,})/;

/** SHA-256 in hex, computed here with node:crypto as the reference for what the server stores. */
const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

describe('sign-in and sign-out', () => {
  let t: InProcessApp;
  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  });
  afterAll(async () => {
    await t?.close();
  });

  it('signs a seeded user in with an httpOnly, SameSite=Lax session cookie and returns their memberships', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .set('Origin', TRUSTED_ORIGIN)
      .send({ email: '  Surveyor@Harrowby.Example ', password: DEMO_PASSWORD })
      .expect(200);
    const session = SessionSchema.parse(res.body);
    expect(session.user.email).toBe(demoEmail('surveyor'));
    expect(session.memberships).toHaveLength(1);
    expect(session.memberships[0]!.role).toBe('surveyor');
    const cookieLine = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('fw.sid='))!;
    expect(cookieLine).toMatch(/; HttpOnly/i);
    expect(cookieLine).toMatch(/; SameSite=Lax/i);
    expect(cookieLine).not.toMatch(/; Secure/i); // http://127.0.0.1 is not https

    const again = await request(t.app).get('/api/auth/session').set('Cookie', sessionCookie(res)).expect(200);
    expect(SessionSchema.parse(again.body).user.id).toBe(session.user.id);
  });

  it('gives a new session id at sign-in, so a cookie planted before sign-in is not the signed-in one', async () => {
    const first = await signIn(t.app, demoEmail('viewer'));
    const second = await first.agent.post('/api/auth/sign-in').set('Origin', TRUSTED_ORIGIN).send({ email: demoEmail('viewer'), password: DEMO_PASSWORD }).expect(200);
    expect(sessionCookie(second)).not.toBe(first.cookie);
    await request(t.app).get('/api/auth/session').set('Cookie', first.cookie).expect(401);
  });

  it('refuses a wrong password with 401 INVALID_CREDENTIALS and the same answer for an unknown e-mail', async () => {
    const wrong = await request(t.app).post('/api/auth/sign-in').set('Origin', TRUSTED_ORIGIN).send({ email: demoEmail('admin'), password: 'not-the-password' });
    expectError(wrong, 401, 'INVALID_CREDENTIALS');
    const unknown = await request(t.app).post('/api/auth/sign-in').set('Origin', TRUSTED_ORIGIN).send({ email: 'nobody@harrowby.example', password: 'not-the-password' });
    expectError(unknown, 401, 'INVALID_CREDENTIALS');
    expect(unknown.body).toEqual(wrong.body);
    expect(wrong.headers['set-cookie']).toBeUndefined();
  });

  it('answers 401 UNAUTHENTICATED for the session when nobody is signed in', async () => {
    expectError(await request(t.app).get('/api/auth/session'), 401, 'UNAUTHENTICATED');
  });

  it('ends the session server-side on sign-out, so the old cookie is refused afterwards', async () => {
    const { agent, cookie, session } = await signIn(t.app, demoEmail('reviewer'));
    const before = await countRows(t.databaseUrl, 'session', `sess->>'userId' = '${session.user.id}'`);
    expect(before).toBeGreaterThanOrEqual(1);
    const out = await agent.post('/api/auth/sign-out').set('Origin', TRUSTED_ORIGIN).expect(204);
    expect(String(out.headers['set-cookie'])).toMatch(/fw\.sid=;/);
    expect(await countRows(t.databaseUrl, 'session', `sess->>'userId' = '${session.user.id}'`)).toBe(before - 1);
    expectError(await request(t.app).get('/api/auth/session').set('Cookie', cookie), 401, 'UNAUTHENTICATED');
  });

  it('audits signing in and out against the user, with the request id, and not a sign-out without a session', async () => {
    const { agent, session } = await signIn(t.app, demoEmail('emc'));
    const out = await agent.post('/api/auth/sign-out').set('Origin', TRUSTED_ORIGIN).expect(204);
    await request(t.app).post('/api/auth/sign-out').set('Origin', TRUSTED_ORIGIN).expect(204);
    const rows = await sql<{ action: string; actor_user_id: string; entity: string; entity_id: string; organisation_id: string | null; request_id: string; after: unknown }>(
      t.databaseUrl,
      `SELECT action, actor_user_id, entity, entity_id, organisation_id, request_id, after FROM audit_log WHERE actor_user_id = $1 AND action IN ('sign_in', 'sign_out') ORDER BY id`,
      [session.user.id],
    );
    expect(rows.map((r) => r.action).slice(-2)).toEqual(['sign_in', 'sign_out']);
    const last = rows.at(-1)!;
    expect(last).toMatchObject({ actor_user_id: session.user.id, entity: 'users', entity_id: session.user.id, organisation_id: null, after: null });
    expect(last.request_id).toBe(out.headers['x-request-id']);
    expect(await countRows(t.databaseUrl, 'audit_log', `action = 'sign_out' AND actor_user_id IS NULL`)).toBe(0);
  });

  it('reads the membership on every request, so a membership taken away applies from the next request', async () => {
    const { agent, session } = await signIn(t.app, demoEmail('viewer'));
    const orgId = session.memberships[0]!.organisationId;
    await agent.get(`/api/orgs/${orgId}/sites`).expect(200);
    const [taken] = await sql<{ role: string }>(t.databaseUrl, 'DELETE FROM memberships WHERE user_id = $1 AND organisation_id = $2 RETURNING role', [session.user.id, orgId]);
    try {
      expectError(await agent.get(`/api/orgs/${orgId}/sites`), 404, 'NOT_FOUND');
    } finally {
      await sql(t.databaseUrl, 'INSERT INTO memberships (user_id, organisation_id, role) VALUES ($1, $2, $3)', [session.user.id, orgId, taken!.role]);
    }
    await agent.get(`/api/orgs/${orgId}/sites`).expect(200);
  });

  it('moves a session’s stored expiry forward once, not on every request', async () => {
    const { agent, session } = await signIn(t.app, demoEmail('emc'));
    const expiry = async () => (await sql<{ expire: Date }>(t.databaseUrl, `SELECT expire FROM session WHERE sess->>'userId' = $1 ORDER BY expire DESC LIMIT 1`, [session.user.id]))[0]!.expire.getTime();
    const atSignIn = await expiry();
    // The store keeps the expiry in whole seconds: wait past one.
    await new Promise((resolve) => setTimeout(resolve, 1_100));
    await agent.get('/api/auth/session').expect(200);
    const touched = await expiry();
    expect(touched).toBeGreaterThan(atSignIn);
    await new Promise((resolve) => setTimeout(resolve, 1_100));
    await agent.get('/api/auth/session').expect(200);
    await agent.get('/api/auth/session').expect(200);
    expect(await expiry()).toBe(touched);
  });
});

describe('sign-in rate limit', () => {
  let t: InProcessApp;
  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo }); // the default limits: 5 failures per e-mail per 15 minutes
  });
  afterAll(async () => {
    await t?.close();
  });

  it('answers 429 RATE_LIMITED after five failed attempts on one e-mail, even with the right password', async () => {
    const attempt = (email: string, password: string) =>
      request(t.app).post('/api/auth/sign-in').set('Origin', TRUSTED_ORIGIN).send({ email, password });
    for (let i = 0; i < 5; i += 1) expectError(await attempt(demoEmail('emc'), `wrong-password-${i}`), 401, 'INVALID_CREDENTIALS');
    const limited = await attempt(demoEmail('emc'), 'wrong-password-again');
    expectError(limited, 429, 'RATE_LIMITED');
    expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0);
    expectError(await attempt(demoEmail('emc'), DEMO_PASSWORD), 429, 'RATE_LIMITED');
    // Another account from the same address is not locked out by someone guessing at this one.
    expect((await attempt(demoEmail('viewer'), DEMO_PASSWORD)).status).toBe(200);
  });

  it('limits password-reset requests per e-mail too', async () => {
    const ask = () => request(t.app).post('/api/auth/password-reset/request').set('Origin', TRUSTED_ORIGIN).send({ email: 'someone@harrowby.example' });
    for (let i = 0; i < 3; i += 1) expect((await ask()).status).toBe(202);
    expectError(await ask(), 429, 'RATE_LIMITED');
  });
});

describe('invitations', () => {
  let t: InProcessApp;
  let harrowbyId: string;
  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  });
  afterAll(async () => {
    await t?.close();
  });

  it('invites by e-mail, previews the link, and accepting signs the new person in with the invited role', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    harrowbyId = admin.session.memberships[0]!.organisationId;
    const email = 'new.engineer@harrowby.example';

    const created = await admin.agent.post(`/api/orgs/${harrowbyId}/invitations`).set('Origin', TRUSTED_ORIGIN).send({ email: 'New.Engineer@Harrowby.example', role: 'emc' }).expect(201);
    const invitation = InvitationSchema.parse(created.body);
    expect(invitation).toMatchObject({ email, role: 'emc' });

    const mail = await t.capture.waitFor((m) => m.to.includes(email));
    expect(mail.subject).toMatch(/invited/i);
    expect(mail.text).toContain(`${TRUSTED_ORIGIN}/invitations/`);
    const token = tokenFromLink(mail.text, INVITE_LINK);

    // Only the token's SHA-256 is stored.
    const [stored] = await sql<{ token_hash: string }>(t.databaseUrl, 'SELECT token_hash FROM invitations WHERE id = $1', [invitation.id]);
    expect(stored!.token_hash).toBe(sha256(token));
    expect(JSON.stringify(await sql(t.databaseUrl, 'SELECT * FROM invitations'))).not.toContain(token);

    const listed = await admin.agent.get(`/api/orgs/${harrowbyId}/invitations`).expect(200);
    expect(listed.body.invitations.map((i: { id: string }) => i.id)).toContain(invitation.id);

    const preview = InvitationPreviewSchema.parse((await request(t.app).get(`/api/invitations/${token}`).expect(200)).body);
    expect(preview).toMatchObject({ email, role: 'emc', hasAccount: false });
    expect(preview.organisationName).toBe(admin.session.memberships[0]!.organisationName);

    const invitee = request.agent(t.app);
    const accepted = await invitee.post(`/api/invitations/${token}/accept`).set('Origin', TRUSTED_ORIGIN).send({ name: 'Nia Engineer', password: 'a-long-new-password' }).expect(200);
    const session = SessionSchema.parse(accepted.body);
    expect(session.user).toMatchObject({ email, name: 'Nia Engineer' });
    expect(session.memberships).toEqual([{ organisationId: harrowbyId, organisationName: preview.organisationName, role: 'emc' }]);
    expect(SessionSchema.parse((await invitee.get('/api/auth/session').expect(200)).body).user.email).toBe(email);
    // The new person can use what an EMC engineer may use, and nothing an admin may.
    await invitee.get(`/api/orgs/${harrowbyId}/sites`).expect(200);
    await invitee.get(`/api/orgs/${harrowbyId}/members`).expect(403);
    // And can sign in again with the password chosen at acceptance.
    await signIn(t.app, email, 'a-long-new-password');
    // Accepting signed them in, which is audited like any sign-in (then the sign-in just above).
    const signIns = await sql<{ n: number }>(t.databaseUrl, `SELECT count(*)::int AS n FROM audit_log WHERE action = 'sign_in' AND actor_user_id = $1`, [session.user.id]);
    expect(signIns[0]!.n).toBe(2);

    // Every write left an audit row in the organisation.
    const audit = await sql<{ action: string; entity: string; entity_id: string; actor_user_id: string | null }>(
      t.databaseUrl,
      'SELECT action, entity, entity_id, actor_user_id FROM audit_log WHERE organisation_id = $1 ORDER BY id',
      [harrowbyId],
    );
    expect(audit).toEqual(
      expect.arrayContaining([
        { action: 'create', entity: 'invitations', entity_id: invitation.id, actor_user_id: admin.session.user.id },
        { action: 'create', entity: 'users', entity_id: session.user.id, actor_user_id: session.user.id },
        { action: 'create', entity: 'memberships', entity_id: `${session.user.id}:${harrowbyId}`, actor_user_id: session.user.id },
        { action: 'accept', entity: 'invitations', entity_id: invitation.id, actor_user_id: session.user.id },
      ]),
    );

    // Admins read the same rows through the API, newest first.
    const feed = AuditListSchema.parse((await admin.agent.get(`/api/orgs/${harrowbyId}/audit?limit=10`).expect(200)).body);
    expect(feed.entries[0]).toMatchObject({ action: 'accept', entity: 'invitations', entityId: invitation.id, actorName: 'Nia Engineer' });

    // The link is single-use, and the invitation leaves the pending list.
    expectError(await request(t.app).get(`/api/invitations/${token}`), 404, 'NOT_FOUND');
    expectError(await request(t.app).post(`/api/invitations/${token}/accept`).set('Origin', TRUSTED_ORIGIN).send({ name: 'Someone', password: 'another-long-password' }), 404, 'NOT_FOUND');
    const after = await admin.agent.get(`/api/orgs/${harrowbyId}/invitations`).expect(200);
    expect(after.body.invitations.map((i: { id: string }) => i.id)).not.toContain(invitation.id);
  });

  it('adds an existing account to the organisation only with that account’s own password', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    await admin.agent.post(`/api/orgs/${harrowbyId}/invitations`).set('Origin', TRUSTED_ORIGIN).send({ email: KESTREL_ADMIN, role: 'viewer' }).expect(201);
    const token = tokenFromLink((await t.capture.waitFor((m) => m.to.includes(KESTREL_ADMIN))).text, INVITE_LINK);
    expect(InvitationPreviewSchema.parse((await request(t.app).get(`/api/invitations/${token}`).expect(200)).body).hasAccount).toBe(true);

    const memberships = () => countRows(t.databaseUrl, 'memberships');
    const before = await memberships();
    expectError(await request(t.app).post(`/api/invitations/${token}/accept`).set('Origin', TRUSTED_ORIGIN).send({ name: 'x', password: 'not-their-password' }), 401, 'INVALID_CREDENTIALS');
    expect(await memberships()).toBe(before);

    const ok = await request(t.app).post(`/api/invitations/${token}/accept`).set('Origin', TRUSTED_ORIGIN).send({ name: 'ignored', password: DEMO_PASSWORD }).expect(200);
    const roles = SessionSchema.parse(ok.body).memberships.map((m) => [m.organisationId === harrowbyId ? 'harrowby' : 'kestrel', m.role]);
    expect(roles).toEqual(expect.arrayContaining([['harrowby', 'viewer'], ['kestrel', 'admin']]));
    expect(await memberships()).toBe(before + 1);
  });

  it('refuses to invite someone who is already a member (409), and only admins may invite', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    expectError(await admin.agent.post(`/api/orgs/${harrowbyId}/invitations`).set('Origin', TRUSTED_ORIGIN).send({ email: demoEmail('viewer'), role: 'admin' }), 409, 'ALREADY_MEMBER');
    const reviewer = await signIn(t.app, demoEmail('reviewer'));
    const before = await countRows(t.databaseUrl, 'invitations');
    expectError(await reviewer.agent.post(`/api/orgs/${harrowbyId}/invitations`).set('Origin', TRUSTED_ORIGIN).send({ email: 'x@harrowby.example', role: 'admin' }), 403, 'FORBIDDEN');
    expect(await countRows(t.databaseUrl, 'invitations')).toBe(before);
  });

  it('refuses an expired invitation', async () => {
    const admin = await signIn(t.app, demoEmail('admin'));
    const email = 'late.comer@harrowby.example';
    const created = await admin.agent.post(`/api/orgs/${harrowbyId}/invitations`).set('Origin', TRUSTED_ORIGIN).send({ email, role: 'surveyor' }).expect(201);
    const token = tokenFromLink((await t.capture.waitFor((m) => m.to.includes(email))).text, INVITE_LINK);
    await sql(t.databaseUrl, "UPDATE invitations SET expires_at = now() - interval '1 minute' WHERE id = $1", [created.body.id]);
    expectError(await request(t.app).get(`/api/invitations/${token}`), 404, 'NOT_FOUND');
    expectError(await request(t.app).post(`/api/invitations/${token}/accept`).set('Origin', TRUSTED_ORIGIN).send({ name: 'Late', password: 'a-long-new-password' }), 404, 'NOT_FOUND');
    expect(await countRows(t.databaseUrl, 'users', `email = '${email}'`)).toBe(0);
  });
});

describe('password reset', () => {
  let t: InProcessApp;
  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  });
  afterAll(async () => {
    await t?.close();
  });

  const requestReset = (email: string) => request(t.app).post('/api/auth/password-reset/request').set('Origin', TRUSTED_ORIGIN).send({ email });
  const confirm = (token: string, password: string) => request(t.app).post('/api/auth/password-reset/confirm').set('Origin', TRUSTED_ORIGIN).send({ token, password });
  const attempt = (email: string, password: string) => request(t.app).post('/api/auth/sign-in').set('Origin', TRUSTED_ORIGIN).send({ email, password });

  it('mails a single-use link; the new password works, the old one and other sessions stop working', async () => {
    const email = demoEmail('viewer');
    const elsewhere = await signIn(t.app, email);

    // Unknown and known e-mails get the same answer.
    const unknown = await requestReset('nobody.here@harrowby.example');
    const known = await requestReset(email);
    expect(unknown.status).toBe(202);
    expect(known.status).toBe(202);
    expect(known.body).toEqual(unknown.body);

    const mail = await t.capture.waitFor((m) => m.to.includes(email) && /reset/i.test(m.subject));
    expect(mail.text).toContain(`${TRUSTED_ORIGIN}/reset-password?token=`);
    const token = tokenFromLink(mail.text, RESET_LINK);
    const [stored] = await sql<{ token_hash: string }>(t.databaseUrl, 'SELECT token_hash FROM password_reset_tokens ORDER BY created_at DESC LIMIT 1');
    expect(stored!.token_hash).toBe(sha256(token));

    await confirm(token, 'my-brand-new-password').expect(204);
    expectError(await attempt(email, DEMO_PASSWORD), 401, 'INVALID_CREDENTIALS');
    expect((await attempt(email, 'my-brand-new-password')).status).toBe(200);
    expectError(await elsewhere.agent.get('/api/auth/session'), 401, 'UNAUTHENTICATED');

    // Single use.
    expectError(await confirm(token, 'yet-another-password'), 400, 'TOKEN_INVALID');
    expect((await attempt(email, 'my-brand-new-password')).status).toBe(200);

    // The change is in the audit log (an account change, outside any one organisation), without hashes.
    const [row] = await sql<{ action: string; after: Record<string, unknown> }>(
      t.databaseUrl,
      "SELECT action, after FROM audit_log WHERE entity = 'users' AND entity_id = $1 AND action = 'update'",
      [elsewhere.session.user.id],
    );
    expect(row?.action).toBe('update');
    expect(JSON.stringify(row?.after)).not.toMatch(/scrypt/);
    const tokenRows = await sql<{ n: number }>(
      t.databaseUrl,
      "SELECT count(*)::int AS n FROM audit_log WHERE entity = 'password_reset_tokens' AND action = 'create' AND after->>'userId' = $1",
      [elsewhere.session.user.id],
    );
    expect(tokenRows[0]!.n).toBe(1);

    // Nothing was mailed to the unknown address.
    expect((await t.capture.list()).some((m) => m.to.includes('nobody.here@harrowby.example'))).toBe(false);
  });

  it('refuses an expired link and a made-up one with 400 TOKEN_INVALID', async () => {
    const email = demoEmail('emc');
    await requestReset(email).expect(202);
    const token = tokenFromLink((await t.capture.waitFor((m) => m.to.includes(email))).text, RESET_LINK);
    await sql(t.databaseUrl, "UPDATE password_reset_tokens SET expires_at = now() - interval '1 second' WHERE token_hash = $1", [sha256(token)]);
    expectError(await confirm(token, 'too-late-password'), 400, 'TOKEN_INVALID');
    expect((await attempt(email, DEMO_PASSWORD)).status).toBe(200);
    expectError(await confirm('A'.repeat(43), 'made-up-password'), 400, 'TOKEN_INVALID');
  });
});
