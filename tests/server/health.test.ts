import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HealthSchema } from '../../shared/schemas/health';
import { createApp } from '../../server/app';
import { createDb } from '../../server/db/client';
import { freePort } from '../../server/db/local-postgres';
import { createMailer } from '../../server/lib/mail';
import { createTestApp, TEST_SESSION_SECRET, testLogger, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

describe('GET /api/health', () => {
  let t: InProcessApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(async () => {
    await t?.close();
  });

  it('reports the database up when it answers', async () => {
    const res = await request(t.app).get('/api/health').expect(200);
    expect(HealthSchema.parse(res.body)).toEqual({ ok: true, database: 'up' });
    expect(res.headers['x-request-id']).toMatch(/[0-9a-f-]{36}/);
  });

  it('keeps a sane X-Request-Id given by the caller', async () => {
    const res = await request(t.app).get('/api/health').set('X-Request-Id', 'probe-42').expect(200);
    expect(res.headers['x-request-id']).toBe('probe-42');
  });

  it('answers 503 with database "down", in the same JSON shape, when PostgreSQL cannot be reached', async () => {
    // Nothing listens on a port the kernel just handed out and released.
    const closedPort = await freePort();
    const { pool, db } = createDb(`postgres://fringewalk@127.0.0.1:${closedPort}/nowhere`, { onIdleError: () => {} });
    const mailer = createMailer({ smtpUrl: t.capture.url, from: 'test@fringewalk.invalid' });
    const { app, close } = createApp({
      db,
      pool,
      logger: testLogger(),
      mailer,
      publicUrl: TRUSTED_ORIGIN,
      trustedOrigins: [TRUSTED_ORIGIN],
      sessionSecret: TEST_SESSION_SECRET,
    });
    try {
      const res = await request(app).get('/api/health').expect(503);
      expect(res.headers['content-type']).toMatch(/application\/json/);
      expect(HealthSchema.parse(res.body)).toEqual({ ok: false, database: 'down' });

      // A data route with the database down is a clean 503, not a 500 or a hang.
      const signIn = await request(app)
        .post('/api/auth/sign-in')
        .set('Origin', TRUSTED_ORIGIN)
        .send({ email: 'someone@harrowby.example', password: 'whatever-password' })
        .expect(503);
      expect(signIn.body.error.code).toBe('SERVICE_UNAVAILABLE');
    } finally {
      await close();
      mailer.close();
      await pool.end();
    }
  });
});
