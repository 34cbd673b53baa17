/**
 * Attachments (issue 5 §6): a photo captured offline reaches the object store after its record, is
 * verified by SHA-256, shows as pending until then, survives an interrupted upload, and opens on a
 * second device. The object store is the local fake S3 (s3rver) the test app starts.
 */
import { createHash } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AttachmentUploadResultSchema, PullResponseSchema } from '../../shared/schemas/sync';
import type { Mutation } from '../../shared/sync/mutation';
import { seedDemo } from '../../server/db/seed/demo';
import { countRows, demoEmail, expectError, KESTREL_ADMIN, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { makeReading, makeStation, makeSweep, mutationFor, readDemoIds, type DemoIds, type Scope } from '../setup/sync-fixtures';
import { createTestApp, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
let surveyor: SignedIn;
let reviewer: SignedIn;
let scope: Scope;
let photo: Buffer;

const sha256 = (b: Buffer | string) => createHash('sha256').update(b).digest('hex');

async function push(mutations: Mutation[]) {
  const res = await surveyor.agent.post(`/api/orgs/${ids.orgId}/sync/push`).set('Origin', TRUSTED_ORIGIN).send({ deviceId: 'camera-device', mutations });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  expect(res.body.results.every((r: { status: string }) => r.status === 'applied'), JSON.stringify(res.body)).toBe(true);
}

const put = (who: SignedIn, recordId: string, kind: string, body: Buffer, sha: string, type = 'image/png') =>
  who.agent.put(`/api/orgs/${ids.orgId}/attachments/${recordId}/${kind}`).set('Origin', TRUSTED_ORIGIN).set('Content-Type', type).set('X-Content-SHA256', sha).send(body);

const download = (who: SignedIn, recordId: string, kind: string) =>
  who.agent
    .get(`/api/orgs/${ids.orgId}/attachments/${recordId}/${kind}`)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    });

async function pulledRecord(who: SignedIn, id: string) {
  let cursor = '0';
  let found: Record<string, unknown> | undefined;
  for (;;) {
    const res = await who.agent.get(`/api/orgs/${ids.orgId}/sync/pull`).query({ since: cursor, limit: 5000 }).expect(200);
    const page = PullResponseSchema.parse(res.body);
    for (const c of page.changes) if (c.record.id === id) found = { ...c.record, seq: c.seq };
    cursor = page.nextCursor;
    if (!page.hasMore) return found;
  }
}

/** A reading that names `file` as its photo, pushed (the record goes first). */
async function readingWithPhoto(file: Buffer) {
  const station = makeStation(scope);
  const reading = makeReading(scope, station.id, { photoSha256: sha256(file) });
  await push([mutationFor('stations', station), mutationFor('field_readings', reading)]);
  return reading;
}

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo });
  ids = await readDemoIds(t.databaseUrl);
  surveyor = await signIn(t.app, demoEmail('surveyor'));
  reviewer = await signIn(t.app, demoEmail('reviewer'));
  scope = { orgId: ids.orgId, surveyId: ids.openSurveyId, levelId: ids.levelId, userId: ids.users.surveyor };
  // A real PNG with some noise, big enough to be cut in half meaningfully.
  const pixels = Buffer.alloc(200 * 200 * 3);
  for (let i = 0; i < pixels.length; i += 1) pixels[i] = (i * 2654435761) >>> 24;
  photo = await sharp(pixels, { raw: { width: 200, height: 200, channels: 3 } }).png({ compressionLevel: 0 }).toBuffer();
});
afterAll(async () => {
  await t?.close();
});

describe('attachments', () => {
  it('keeps nothing when the checksum is wrong, stores the file when it is right, and clears attachmentPending', async () => {
    const reading = await readingWithPhoto(photo);
    const before = await pulledRecord(surveyor, reading.id);
    expect(before).toMatchObject({ attachmentPending: true, photoObjectKey: `orgs/${ids.orgId}/field_readings/${reading.id}/photo-${sha256(photo)}`, revision: 1 });

    const damaged = Buffer.from(photo);
    const middle = damaged.length >> 1;
    damaged[middle] = damaged[middle]! ^ 0xff;
    const bad = await put(surveyor, reading.id, 'photo', damaged, sha256(photo));
    expectError(bad, 422, 'CHECKSUM_MISMATCH');
    expect(await t.storage.listKeys(`orgs/${ids.orgId}/field_readings/${reading.id}/`)).toEqual([]);
    expect(await countRows(t.databaseUrl, 'attachments', `record_id = '${reading.id}'`)).toBe(0);

    const good = await put(surveyor, reading.id, 'photo', photo, sha256(photo));
    expect(good.status, JSON.stringify(good.body)).toBe(201);
    expect(AttachmentUploadResultSchema.parse(good.body)).toMatchObject({ sha256: sha256(photo), bytes: photo.length, contentType: 'image/png', alreadyStored: false });
    const again = await put(surveyor, reading.id, 'photo', photo, sha256(photo));
    expect(again.status).toBe(200);
    expect(again.body.alreadyStored).toBe(true);

    const after = await pulledRecord(surveyor, reading.id);
    expect(after).toMatchObject({ attachmentPending: false, revision: 1 });
    expect(after!.seq as number).toBeGreaterThan(before!.seq as number);
  });

  it('opens on a second device with the same bytes', async () => {
    const reading = await readingWithPhoto(photo);
    const pending = await download(reviewer, reading.id, 'photo');
    expectError({ ...pending, body: JSON.parse(pending.body.toString()) } as never, 404, 'NOT_FOUND');
    await put(surveyor, reading.id, 'photo', photo, sha256(photo)).expect(201);
    const res = await download(reviewer, reading.id, 'photo');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/png');
    expect(res.headers['x-content-sha256']).toBe(sha256(photo));
    expect(sha256(res.body as Buffer)).toBe(sha256(photo));
  });

  it('an upload interrupted halfway keeps nothing, and the next attempt completes with an intact file', async () => {
    const reading = await readingWithPhoto(photo);
    const server = http.createServer(t.app);
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    const port = (server.address() as AddressInfo).port;
    try {
      await new Promise<void>((resolve) => {
        const req = http.request({
          host: '127.0.0.1',
          port,
          method: 'PUT',
          path: `/api/orgs/${ids.orgId}/attachments/${reading.id}/photo`,
          headers: { Cookie: surveyor.cookie, Origin: TRUSTED_ORIGIN, 'Content-Type': 'image/png', 'Content-Length': photo.length, 'X-Content-SHA256': sha256(photo) },
        });
        req.on('error', () => resolve());
        req.on('response', () => resolve());
        req.write(photo.subarray(0, photo.length >> 1), () => setTimeout(() => req.destroy(), 50));
      });
      // Give the server a moment to see the abort.
      await new Promise((resolve) => setTimeout(resolve, 100));
      expect(await t.storage.listKeys(`orgs/${ids.orgId}/field_readings/${reading.id}/`)).toEqual([]);
      expect(await countRows(t.databaseUrl, 'attachments', `record_id = '${reading.id}'`)).toBe(0);
      expect((await pulledRecord(surveyor, reading.id))!.attachmentPending).toBe(true);

      await put(surveyor, reading.id, 'photo', photo, sha256(photo)).expect(201);
      const res = await download(surveyor, reading.id, 'photo');
      expect(sha256(res.body as Buffer)).toBe(sha256(photo));
      expect((res.body as Buffer).length).toBe(photo.length);
    } finally {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
    }
  });

  it('takes a sweep’s trace as CSV', async () => {
    const station = makeStation(scope);
    const csv = Buffer.from('frequency_hz,level_dbm\n2450000000,-61.5\n2451000000,-70.2\n');
    const sweep = makeSweep(scope, station.id, { traceSha256: sha256(csv) });
    await push([mutationFor('stations', station), mutationFor('sweeps', sweep)]);
    expect((await pulledRecord(surveyor, sweep.id))!.attachmentPending).toBe(true);
    await put(surveyor, sweep.id, 'trace', csv, sha256(csv), 'text/csv').expect(201);
    expect((await pulledRecord(surveyor, sweep.id))!.attachmentPending).toBe(false);
    const res = await download(reviewer, sweep.id, 'trace');
    expect((res.body as Buffer).toString()).toBe(csv.toString());
  });

  it('refuses files the record does not name, wrong types, and callers who may not write', async () => {
    const reading = await readingWithPhoto(photo);
    const other = await sharp({ create: { width: 4, height: 4, channels: 3, background: '#123456' } }).png().toBuffer();
    expectError(await put(surveyor, reading.id, 'photo', other, sha256(other)), 409, 'ATTACHMENT_MISMATCH');
    expectError(await put(surveyor, reading.id, 'photo', photo, sha256(photo), 'application/pdf'), 415, 'UNSUPPORTED_MEDIA_TYPE');
    const text = Buffer.from('not an image at all');
    const textReading = await readingWithPhoto(text);
    expectError(await put(surveyor, textReading.id, 'photo', text, sha256(text)), 415, 'UNSUPPORTED_FILE_TYPE');
    expectError(await put(surveyor, reading.id, 'photo', photo, 'not-a-hash'), 400, 'VALIDATION_FAILED');
    expectError(await put(surveyor, crypto.randomUUID(), 'photo', photo, sha256(photo)), 404, 'NOT_FOUND');
    const surveyor2 = await signIn(t.app, 'surveyor2@harrowby.example');
    expectError(await put(surveyor2, reading.id, 'photo', photo, sha256(photo)), 403, 'NOT_ASSIGNED');
    const kestrel = await signIn(t.app, KESTREL_ADMIN);
    expectError(await put(kestrel, reading.id, 'photo', photo, sha256(photo)), 404, 'NOT_FOUND');
    expect(await sql(t.databaseUrl, `SELECT 1 FROM attachments WHERE record_id = $1`, [reading.id])).toEqual([]);
  });
});
