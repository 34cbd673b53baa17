/**
 * The real server as the browser tests get it (tests/setup/start-app.ts): a port of its own, the
 * client folder with the SPA fallback and cache headers, e-mail captured over SMTP, and a close()
 * that drops its database.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/start-app';

describe('startTestApp', () => {
  let app: TestApp;
  let clientDir: string;

  beforeAll(async () => {
    // A stand-in for dist/: the server only serves files, so any small folder shows the rules.
    clientDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringewalk-client-'));
    fs.mkdirSync(path.join(clientDir, 'assets'));
    fs.writeFileSync(path.join(clientDir, 'index.html'), '<!doctype html><title>Fringewalk</title><div id="root"></div>');
    fs.writeFileSync(path.join(clientDir, 'sw.js'), 'self.addEventListener("fetch", () => {});');
    fs.writeFileSync(path.join(clientDir, 'manifest.webmanifest'), '{"name":"Fringewalk"}');
    fs.writeFileSync(path.join(clientDir, 'assets', 'index-abc123.js'), 'console.log(1)');
    app = await startTestApp({ seed: 'demo', clientDir });
  });
  afterAll(async () => {
    await app?.close();
    fs.rmSync(clientDir, { recursive: true, force: true });
  });

  it('serves the API and the client on one 127.0.0.1 port, never index.html for /api', async () => {
    expect(app.baseUrl).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
    expect(await (await fetch(`${app.baseUrl}/api/health`)).json()).toEqual({ ok: true, database: 'up' });

    const deepLink = await fetch(`${app.baseUrl}/surveys/some-survey`);
    expect(deepLink.status).toBe(200);
    expect(await deepLink.text()).toContain('<div id="root">');
    expect(deepLink.headers.get('cache-control')).toBe('no-cache');

    const apiMiss = await fetch(`${app.baseUrl}/api/surveys/some-survey`);
    expect(apiMiss.status).toBe(404);
    expect((await apiMiss.json()).error.code).toBe('NOT_FOUND');

    const missingAsset = await fetch(`${app.baseUrl}/assets/index-gone.js`);
    expect(missingAsset.status).toBe(404);
  });

  it('serves the service worker and the manifest with no-cache, hashed assets as immutable', async () => {
    const sw = await fetch(`${app.baseUrl}/sw.js`);
    expect(sw.status).toBe(200);
    expect(sw.headers.get('cache-control')).toBe('no-cache');
    const manifest = await fetch(`${app.baseUrl}/manifest.webmanifest`);
    expect(manifest.headers.get('cache-control')).toBe('no-cache');
    expect(manifest.headers.get('content-type')).toMatch(/application\/manifest\+json/);
    const asset = await fetch(`${app.baseUrl}/assets/index-abc123.js`);
    expect(asset.headers.get('cache-control')).toMatch(/immutable/);
  });

  it('signs in with fetch from the app origin and reads an e-mail back from the capture', async () => {
    const headers = { 'Content-Type': 'application/json', Origin: app.baseUrl };
    const signIn = await fetch(`${app.baseUrl}/api/auth/sign-in`, { method: 'POST', headers, body: JSON.stringify({ email: 'admin@harrowby.example', password: 'fringewalk-demo' }) });
    expect(signIn.status).toBe(200);
    const cookie = signIn.headers.get('set-cookie')!.split(';')[0]!;

    const reset = await fetch(`${app.baseUrl}/api/auth/password-reset/request`, { method: 'POST', headers, body: JSON.stringify({ email: 'viewer@harrowby.example' }) });
    expect(reset.status).toBe(202);
    const mail = await app.mail.waitFor((m) => m.to.includes('viewer@harrowby.example'));
    expect(mail.text).toContain(`${app.baseUrl}/reset-password?token=`);
    expect((await app.mail.list()).map((m) => m.id)).toContain(mail.id);

    // The dev mail page's API shows the same message to an admin.
    const devMail = await fetch(`${app.baseUrl}/api/dev/mail`, { headers: { Cookie: cookie } });
    expect((await devMail.json()).messages[0]).toMatchObject({ id: mail.id, subject: mail.subject });
  });

  it('drops its database on close()', async () => {
    const other = await startTestApp();
    const name = new URL(other.databaseUrl).pathname.slice(1);
    await other.close();
    const admin = new pg.Client({ connectionString: inject('pgAdminUrl') });
    await admin.connect();
    try {
      const { rows } = await admin.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
      expect(rows).toEqual([]);
    } finally {
      await admin.end();
    }
    await expect(fetch(`${other.baseUrl}/api/health`)).rejects.toThrow();
  });
});
