/**
 * Plan uploads against the real app, real PostgreSQL and a real s3rver: every accepted type is stored
 * (object + row) and served back byte for byte; every refusal says why and leaves nothing behind (rows
 * and bucket listing compared before and after); a large raster gets a device copy; other organisations
 * see nothing. All images are invented (tests/fixtures/plan-images.ts).
 */
import { createHash } from 'node:crypto';
import request from 'supertest';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { PLAN_DEVICE_MAX_SIDE_PX, PLAN_UPLOAD_MAX_BYTES, PlanSchema } from '../../shared/schemas/plan';
import { SiteDetailSchema } from '../../shared/schemas/site';
import { countRows, demoEmail, expectError, KESTREL_ADMIN, signIn, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';
import { ELF_BYTES, PLAN_SVG, planRaster, SHELL_SCRIPT, SVG_WITH_HANDLER, SVG_WITH_SCRIPT, truncatedPng } from '../fixtures/plan-images';

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

describe('plan uploads', () => {
  let t: InProcessApp;
  let admin: SignedIn;
  let orgId: string;
  let siteId: string;
  let levelId: string;

  const upload = (who: SignedIn, bytes: Buffer, filename: string, level = levelId) =>
    who.agent.post(`/api/orgs/${orgId}/levels/${level}/plans`).set('Origin', TRUSTED_ORIGIN).attach('file', bytes, { filename, contentType: 'application/octet-stream' });

  const snapshot = async () => ({
    plans: await countRows(t.databaseUrl, 'plans'),
    audit: await countRows(t.databaseUrl, 'audit_log'),
    objects: (await t.storage.listKeys()).sort(),
  });

  const binary = (req: request.Test) =>
    req.buffer(true).parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    });

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
    admin = await signIn(t.app, demoEmail('admin'));
    orgId = admin.session.memberships[0]!.organisationId;
    const site = await admin.agent.post(`/api/orgs/${orgId}/sites`).set('Origin', TRUSTED_ORIGIN).send({ name: 'Upload test hall' }).expect(201);
    siteId = site.body.id;
    const level = await admin.agent.post(`/api/orgs/${orgId}/sites/${siteId}/levels`).set('Origin', TRUSTED_ORIGIN).send({ name: 'Ground', ordinal: 0 }).expect(201);
    levelId = level.body.id;
  });
  afterAll(async () => {
    await t?.close();
  });

  it.each([
    ['png', 'image/png'],
    ['jpeg', 'image/jpeg'],
    ['webp', 'image/webp'],
  ] as const)('stores a %s plan (by content, whatever its name) and serves the same bytes back', async (format, mime) => {
    const bytes = await planRaster(format);
    // A misleading name on purpose: the content decides.
    const res = await upload(admin, bytes, 'drawing.bin').expect(201);
    const plan = PlanSchema.parse(res.body);
    expect(plan).toMatchObject({ mime, widthPx: 640, heightPx: 480, byteSize: bytes.length, sha256: sha256(bytes), device: null, calibration: null, siteId, levelId });
    const image = await binary(admin.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image?variant=original`)).expect(200);
    expect(image.headers['content-type']).toBe(mime);
    expect(sha256(image.body as Buffer)).toBe(plan.sha256);
    // No device copy for a small image: the device variant is the original.
    const device = await binary(admin.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image`)).expect(200);
    expect(sha256(device.body as Buffer)).toBe(plan.sha256);
  });

  it('stores an SVG plan with its size from width/height and serves it sandboxed', async () => {
    const res = await upload(admin, PLAN_SVG, 'plan.svg').expect(201);
    const plan = PlanSchema.parse(res.body);
    expect(plan).toMatchObject({ mime: 'image/svg+xml', widthPx: 800, heightPx: 600, device: null });
    const image = await binary(admin.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image`)).expect(200);
    expect(image.headers['content-type']).toBe('image/svg+xml');
    expect(image.headers['content-security-policy']).toMatch(/sandbox/);
    expect((image.body as Buffer).equals(PLAN_SVG)).toBe(true);
  });

  it('makes the newest upload the level’s current plan and keeps the earlier one’s files', async () => {
    const first = PlanSchema.parse((await upload(admin, await planRaster('png'), 'a.png').expect(201)).body);
    const second = PlanSchema.parse((await upload(admin, PLAN_SVG, 'b.svg').expect(201)).body);
    const level = SiteDetailSchema.parse((await admin.agent.get(`/api/orgs/${orgId}/sites/${siteId}`).expect(200)).body).levels.find((l) => l.id === levelId)!;
    expect(level.plan?.id).toBe(second.id);
    await admin.agent.get(`/api/orgs/${orgId}/plans/${first.id}`).expect(404);
    expect((await t.storage.listKeys(`orgs/${orgId}/plans/${first.id}/`)).length).toBe(1);
  });

  it('downscales a large raster for devices (long side 4096 px, WebP) and keeps the original', async () => {
    const bytes = await planRaster('png', 6000, 3000);
    const plan = PlanSchema.parse((await upload(admin, bytes, 'big.png').expect(201)).body);
    expect(plan).toMatchObject({ widthPx: 6000, heightPx: 3000, device: { mime: 'image/webp', widthPx: PLAN_DEVICE_MAX_SIDE_PX, heightPx: 2048 } });
    const device = await binary(admin.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image?variant=device`)).expect(200);
    expect(device.headers['content-type']).toBe('image/webp');
    const meta = await sharp(device.body as Buffer).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['webp', 4096, 2048]);
    const original = await binary(admin.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image?variant=original`)).expect(200);
    expect(sha256(original.body as Buffer)).toBe(sha256(bytes));
    expect((await t.storage.listKeys(`orgs/${orgId}/plans/${plan.id}/`)).sort()).toEqual([`orgs/${orgId}/plans/${plan.id}/device.webp`, `orgs/${orgId}/plans/${plan.id}/original.png`]);
  });

  describe('refusals leave nothing stored', () => {
    const cases: [string, () => Promise<Buffer> | Buffer, string, number, string, RegExp][] = [
      ['an ELF executable named plan.png', () => ELF_BYTES, 'plan.png', 415, 'UNSUPPORTED_FILE_TYPE', /ELF executable/],
      ['a shell script named plan.png', () => SHELL_SCRIPT, 'plan.png', 415, 'UNSUPPORTED_FILE_TYPE', /script/],
      ['a truncated PNG', truncatedPng, 'plan.png', 422, 'UNREADABLE_IMAGE', /truncated or damaged/],
      ['an SVG with a script', () => SVG_WITH_SCRIPT, 'plan.svg', 422, 'UNSAFE_SVG', /<script>/],
      ['an SVG with an event handler', () => SVG_WITH_HANDLER, 'plan.svg', 422, 'UNSAFE_SVG', /event-handler/],
      ['a file over the size limit', () => Buffer.alloc(PLAN_UPLOAD_MAX_BYTES + 1024, 0x20), 'huge.png', 413, 'PAYLOAD_TOO_LARGE', /larger than 20 MB/],
    ];
    it.each(cases)('%s', async (_name, make, filename, status, code, message) => {
      const before = await snapshot();
      const res = await upload(admin, await make(), filename);
      expectError(res, status, code);
      expect(res.body.error.message).toMatch(message);
      expect(await snapshot()).toEqual(before);
    });

    it('a request without a file', async () => {
      const before = await snapshot();
      const res = await admin.agent.post(`/api/orgs/${orgId}/levels/${levelId}/plans`).set('Origin', TRUSTED_ORIGIN).field('note', 'no file');
      expectError(res, 400, 'VALIDATION_FAILED');
      expect(await snapshot()).toEqual(before);
    });
  });

  it('refuses uploads by viewers and surveyors (403) and stores nothing', async () => {
    // Signed in first: a sign-in leaves an audit row of its own.
    const people = await Promise.all((['viewer', 'surveyor', 'emc'] as const).map((role) => signIn(t.app, demoEmail(role))));
    const before = await snapshot();
    for (const who of people) {
      expectError(await upload(who, await planRaster('png'), 'plan.png'), 403, 'FORBIDDEN');
    }
    expect(await snapshot()).toEqual(before);
  });

  it('serves the demo seed’s plan SVGs from the object store', async () => {
    const demoSite = (await admin.agent.get(`/api/orgs/${orgId}/sites`).expect(200)).body.sites.find((s: { name: string }) => s.name !== 'Upload test hall');
    const site = SiteDetailSchema.parse((await admin.agent.get(`/api/orgs/${orgId}/sites/${demoSite.id}`).expect(200)).body);
    const plan = site.levels.find((l) => l.plan)!.plan!;
    const image = await binary(admin.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image`)).expect(200);
    expect(image.headers['content-type']).toBe('image/svg+xml');
    expect(sha256(image.body as Buffer)).toBe(plan.sha256);
  });

  it('answers 404 for another organisation’s plan, its image and its level', async () => {
    const plan = PlanSchema.parse((await upload(admin, await planRaster('png'), 'mine.png').expect(201)).body);
    const kestrel = await signIn(t.app, KESTREL_ADMIN);
    const kestrelOrg = kestrel.session.memberships[0]!.organisationId;
    // Under the other organisation's own id, the plan simply does not exist there…
    expectError(await kestrel.agent.get(`/api/orgs/${kestrelOrg}/plans/${plan.id}`), 404, 'NOT_FOUND');
    expectError(await kestrel.agent.get(`/api/orgs/${kestrelOrg}/plans/${plan.id}/image`), 404, 'NOT_FOUND');
    expectError(await kestrel.agent.post(`/api/orgs/${kestrelOrg}/levels/${levelId}/plans`).set('Origin', TRUSTED_ORIGIN).attach('file', await planRaster('png'), 'x.png'), 404, 'NOT_FOUND');
    // …and under ours, the caller is no member.
    expectError(await kestrel.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image`), 404, 'NOT_FOUND');
  });

  it('answers 304 when the browser already has the image', async () => {
    const plan = PlanSchema.parse((await upload(admin, await planRaster('png'), 'etag.png').expect(201)).body);
    const first = await admin.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image`).expect(200);
    await admin.agent.get(`/api/orgs/${orgId}/plans/${plan.id}/image`).set('If-None-Match', first.headers.etag as string).expect(304);
  });
});
