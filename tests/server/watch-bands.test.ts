/**
 * Watch bands through the API (real PostgreSQL, demo seed): who may keep them, names unique per scope,
 * the starter set added once, CSV export → import without loss, a file with bad rows reported row by
 * row with nothing imported unless the good rows are asked for, MRI receive bands from the site's
 * scanners, audit rows, and surveyors' devices pulling the changes.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sameBand, STARTER_WATCH_BANDS } from '../../shared/bands/starter-set';
import { MriBandSuggestionListSchema, StarterSetResultSchema, WatchBandImportResultSchema, WatchBandListSchema, WatchBandSchema } from '../../shared/schemas/watch-band';
import { PullResponseSchema } from '../../shared/schemas/sync';
import { seedDemo } from '../../server/db/seed/demo';
import { countRows, demoEmail, expectError, KESTREL_ADMIN, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let admin: SignedIn;
let emc: SignedIn;
let reviewer: SignedIn;
let surveyor: SignedIn;
let kestrel: SignedIn;
let orgId: string;
let kestrelOrgId: string;

const base = (org = orgId) => `/api/orgs/${org}/watch-bands`;
const post = (who: SignedIn, path: string, body: object = {}) => who.agent.post(path).set('Origin', TRUSTED_ORIGIN).send(body);
const band = (name: string, over: object = {}) => ({ name, lowerHz: 300e6, upperHz: 301e6, reason: 'Invented test band', source: 'Invented test data', severity: 'medium', ...over });
const list = async (who: SignedIn, org = orgId) => WatchBandListSchema.parse((await who.agent.get(base(org)).expect(200)).body).watchBands;

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  admin = await signIn(t.app, demoEmail('admin'));
  emc = await signIn(t.app, demoEmail('emc'));
  reviewer = await signIn(t.app, demoEmail('reviewer'));
  surveyor = await signIn(t.app, demoEmail('surveyor'));
  kestrel = await signIn(t.app, KESTREL_ADMIN);
  orgId = admin.session.memberships[0]!.organisationId;
  kestrelOrgId = kestrel.session.memberships[0]!.organisationId;
});
afterAll(async () => {
  await t?.close();
});

describe('keeping watch bands', () => {
  it('an EMC engineer adds, edits and removes a band; reviewers and surveyors may only read', async () => {
    const created = WatchBandSchema.parse((await post(emc, base(), band('Telemetry 300 MHz')).expect(201)).body);
    expect(created).toMatchObject({ name: 'Telemetry 300 MHz', lowerHz: 300e6, upperHz: 301e6, siteId: null, starter: false, revision: 1 });
    expect((await list(surveyor)).some((b) => b.id === created.id)).toBe(true);
    expectError(await post(reviewer, base(), band('Nope')), 403, 'FORBIDDEN');
    expectError(await post(surveyor, base(), band('Nope')), 403, 'FORBIDDEN');

    const edited = WatchBandSchema.parse((await admin.agent.patch(`${base()}/${created.id}`).set('Origin', TRUSTED_ORIGIN).send({ severity: 'high', upperHz: 302e6 }).expect(200)).body);
    expect(edited).toMatchObject({ severity: 'high', upperHz: 302e6, revision: 2 });
    // An edit that would put the upper edge below the stored lower one is refused.
    const backwards = await emc.agent.patch(`${base()}/${created.id}`).set('Origin', TRUSTED_ORIGIN).send({ upperHz: 100e6 });
    expectError(backwards, 400, 'VALIDATION_FAILED');
    expect(backwards.body.error.message).toBe('The upper edge must be above the lower edge.');

    await emc.agent.delete(`${base()}/${created.id}`).set('Origin', TRUSTED_ORIGIN).expect(204);
    expect((await list(emc)).some((b) => b.id === created.id)).toBe(false);
    expect(await countRows(t.databaseUrl, 'audit_log', `entity = 'watch_bands' AND entity_id = '${created.id}'`)).toBe(3);
  });

  it('refuses bad input with the field named, and a second band of the same name (any case)', async () => {
    const swapped = await post(emc, base(), band('Swapped', { lowerHz: 5e6, upperHz: 4e6 }));
    expectError(swapped, 400, 'VALIDATION_FAILED');
    expect(swapped.body.error.details.issues[0]).toMatchObject({ path: 'upperHz' });
    expectError(await post(emc, base(), band('Negative', { lowerHz: -1 })), 400, 'VALIDATION_FAILED');
    expectError(await post(emc, base(), { name: 'No source', lowerHz: 1, upperHz: 2, reason: 'x' }), 400, 'VALIDATION_FAILED');
    expectError(await post(emc, base(), band('Odd severity', { severity: 'extreme' })), 400, 'VALIDATION_FAILED');
    await post(emc, base(), band('Campus paging')).expect(201);
    const twice = await post(admin, base(), band('CAMPUS PAGING'));
    expectError(twice, 409, 'CONFLICT');
    expect(twice.body.error.message).toMatch(/already a band called "CAMPUS PAGING"/);
  });

  it('keeps organisations apart', async () => {
    const mine = (await list(emc))[0]!;
    expectError(await kestrel.agent.get(base()), 404, 'NOT_FOUND');
    expectError(await kestrel.agent.patch(`${base(kestrelOrgId)}/${mine.id}`).set('Origin', TRUSTED_ORIGIN).send({ severity: 'low' }), 404, 'NOT_FOUND');
    expect((await list(kestrel, kestrelOrgId)).some((b) => b.id === mine.id)).toBe(false);
  });
});

describe('the starter set', () => {
  it('adds every starter band once, marked as starter, and nothing the second time', async () => {
    // Kestrel's demo organisation has no bands: the set arrives whole.
    const first = StarterSetResultSchema.parse((await post(kestrel, `${base(kestrelOrgId)}/starter-set`).expect(200)).body);
    expect(first.added.map((b) => b.name).sort()).toEqual(STARTER_WATCH_BANDS.map((b) => b.name).sort());
    expect(first.added.every((b) => b.starter)).toBe(true);
    expect(first.alreadyPresent).toBe(0);
    const second = StarterSetResultSchema.parse((await post(kestrel, `${base(kestrelOrgId)}/starter-set`).expect(200)).body);
    expect(second).toEqual({ added: [], alreadyPresent: STARTER_WATCH_BANDS.length });
    expect(await countRows(t.databaseUrl, 'watch_bands', `organisation_id = '${kestrelOrgId}' AND NOT deleted`)).toBe(STARTER_WATCH_BANDS.length);
  });

  it('in an organisation that has some of them, adds only the missing ones (by name or by the same edges)', async () => {
    const before = await list(emc);
    const present = STARTER_WATCH_BANDS.filter((s) => before.some((b) => b.siteId === null && sameBand(b, s)));
    // The demo watches the H I band under a name of its own ("Radio astronomy — H I line"): not offered again.
    expect(before.some((b) => b.name === 'Radio astronomy — H I line')).toBe(true);
    expect(present.map((s) => s.key)).toContain('ra-1400');
    const res = StarterSetResultSchema.parse((await post(emc, `${base()}/starter-set`).expect(200)).body);
    expect(res.alreadyPresent).toBe(present.length);
    expect(res.added).toHaveLength(STARTER_WATCH_BANDS.length - present.length);
  });
});

describe('CSV', () => {
  it('export → import into another organisation loses nothing', async () => {
    const res = await emc.agent.get(`${base()}/export.csv`).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const csv = res.text;
    expect(csv.split('\r\n')[0]).toBe('name,lower_MHz,upper_MHz,reason,source,severity,threshold_dBW_per_m2_Hz,notes');
    const mine = (await list(emc)).filter((b) => b.siteId === null);
    expect(csv.trimEnd().split('\r\n').length - 1).toBeGreaterThanOrEqual(mine.length); // quoted line breaks only add lines

    // A fresh organisation to import into: Kestrel, emptied of its bands first.
    await sql(t.databaseUrl, `UPDATE watch_bands SET deleted = true WHERE organisation_id = $1`, [kestrelOrgId]);
    const imported = WatchBandImportResultSchema.parse((await post(kestrel, `${base(kestrelOrgId)}/import`, { csv, mode: 'all' }).expect(200)).body);
    expect(imported).toMatchObject({ errors: [], created: mine.length, updated: 0 });
    const theirs = await list(kestrel, kestrelOrgId);
    const key = (b: { name: string; lowerHz: number; upperHz: number; reason: string; source: string; severity: string; thresholdDbWPerM2Hz: number | null; notes: string | null }) => ({
      name: b.name,
      lowerHz: Math.round(b.lowerHz),
      upperHz: Math.round(b.upperHz),
      reason: b.reason,
      source: b.source,
      severity: b.severity,
      thresholdDbWPerM2Hz: b.thresholdDbWPerM2Hz,
      notes: b.notes,
    });
    const byName = (a: { name: string }, b: { name: string }) => a.name.localeCompare(b.name);
    expect(theirs.map(key).sort(byName)).toEqual(mine.map(key).sort(byName));

    // Importing the same file again changes the bands of the same name rather than doubling them.
    const again = WatchBandImportResultSchema.parse((await post(kestrel, `${base(kestrelOrgId)}/import`, { csv, mode: 'all' }).expect(200)).body);
    expect(again).toMatchObject({ created: 0, updated: mine.length });
    expect((await list(kestrel, kestrelOrgId)).length).toBe(mine.length);
  });

  it('a file with bad rows: checked row by row, nothing imported in "all", only the good rows in "valid_rows"', async () => {
    const csv = [
      'name,lower_MHz,upper_MHz,reason,source,severity',
      'Import good one,600,601,Invented,Invented test data,low',
      'Import backwards,610,605,Invented,Invented test data,low',
      'Import good two,620,621,Invented,Invented test data,high',
      'Import wordy,six hundred,630,Invented,Invented test data,low',
    ].join('\n');
    const count = () => countRows(t.databaseUrl, 'watch_bands', `organisation_id = '${orgId}' AND NOT deleted AND name LIKE 'Import %'`);

    const checked = WatchBandImportResultSchema.parse((await post(emc, `${base()}/import`, { csv, mode: 'check' }).expect(200)).body);
    expect(checked).toMatchObject({ rows: 4, valid: 2, created: 0, updated: 0 });
    expect(checked.errors.map((e) => e.line)).toEqual([3, 5]);
    expect(checked.errors[1]!.messages).toEqual(['lower_MHz "six hundred" is not a number.']);
    expect(await count()).toBe(0);

    const refused = await post(emc, `${base()}/import`, { csv, mode: 'all' });
    expectError(refused, 400, 'VALIDATION_FAILED');
    expect(refused.body.error.message).toBe('2 rows have errors, so nothing was imported. Fix them, or import only the good rows.');
    expect(refused.body.error.details.report.errors).toHaveLength(2);
    expect(await count()).toBe(0);

    const partial = WatchBandImportResultSchema.parse((await post(emc, `${base()}/import`, { csv, mode: 'valid_rows' }).expect(200)).body);
    expect(partial).toMatchObject({ created: 2, updated: 0 });
    expect(partial.errors).toHaveLength(2);
    expect(await count()).toBe(2);
  });

  it('refuses an empty file, and a reviewer importing', async () => {
    expectError(await post(emc, `${base()}/import`, { csv: '', mode: 'all' }), 400, 'VALIDATION_FAILED');
    expectError(await post(reviewer, `${base()}/import`, { csv: 'name\n', mode: 'check' }), 403, 'FORBIDDEN');
  });
});

describe('MRI receive bands', () => {
  it('offers each MRI scanner’s precession band for its site and adds it once, as a band of that site', async () => {
    const [site] = await sql<{ id: string }>(t.databaseUrl, `SELECT id FROM sites WHERE organisation_id = $1 AND name LIKE 'Harrowby%' LIMIT 1`, [orgId]);
    const magnets = await sql<{ id: string; name: string; nominal_field_t: number }>(
      t.databaseUrl,
      `SELECT id, name, nominal_field_t FROM sources WHERE site_id = $1 AND kind = 'mri' AND NOT deleted ORDER BY name`,
      [site!.id],
    );
    expect(magnets.length).toBeGreaterThan(0);
    const { suggestions } = MriBandSuggestionListSchema.parse((await surveyor.agent.get(`/api/orgs/${orgId}/sites/${site!.id}/mri-bands`).expect(200)).body);
    expect(suggestions.map((s) => s.sourceId)).toEqual(magnets.map((m) => m.id));
    for (const s of suggestions) {
      // γp/2π = 42.577 478 518 MHz/T (CODATA 2018) times the scanner's field, ±500 kHz.
      const centre = 42.577478518e6 * s.nominalFieldT;
      expect((s.band.lowerHz + s.band.upperHz) / 2).toBeCloseTo(centre, 0);
      expect(s.band.reason).toMatch(/Precession, not a cyclotron line/);
    }
    // The demo already watches MR 1's band under its own name (same edges): not offered twice.
    const demoBand = (await list(emc)).find((b) => b.name === 'MR 1 receive band (proton precession at 3 T)')!;
    expect(suggestions.find((s) => Math.abs(s.nominalFieldT - 3) < 1e-9)!.existingId).toBe(demoBand.id);

    // A new 1.5 T scanner on the site: its band (63.866 MHz) is offered, added once, then shown as watched.
    const scanner = (await post(admin, `/api/orgs/${orgId}/sites/${site!.id}/sources`, { name: 'MR 2 test scanner', kind: 'mri', nominalFieldT: 1.5 }).expect(201)).body.id as string;
    const offered = MriBandSuggestionListSchema.parse((await emc.agent.get(`/api/orgs/${orgId}/sites/${site!.id}/mri-bands`).expect(200)).body).suggestions.find((s) => s.sourceId === scanner)!;
    expect(offered.existingId).toBeNull();
    expect(offered.band.name).toBe('MR 2 test scanner receive band (63.866 MHz)');
    const first = offered;
    const added = WatchBandSchema.parse((await post(emc, `/api/orgs/${orgId}/sites/${site!.id}/mri-bands/${first.sourceId}`).expect(201)).body);
    expect(added).toMatchObject({ siteId: site!.id, name: first.band.name });
    expectError(await post(emc, `/api/orgs/${orgId}/sites/${site!.id}/mri-bands/${first.sourceId}`), 409, 'CONFLICT');
    const after = MriBandSuggestionListSchema.parse((await emc.agent.get(`/api/orgs/${orgId}/sites/${site!.id}/mri-bands`).expect(200)).body).suggestions;
    expect(after.find((s) => s.sourceId === scanner)!.existingId).toBe(added.id);
    // A site band is not in the organisation's CSV.
    expect((await emc.agent.get(`${base()}/export.csv`).expect(200)).text).not.toContain(first.band.name);
    // A magnet that is not on the site is 404.
    expectError(await post(emc, `/api/orgs/${orgId}/sites/${site!.id}/mri-bands/01890000-0000-7000-8000-000000000000`), 404, 'NOT_FOUND');
  });
});

describe('devices', () => {
  it('a surveyor’s pull carries new bands and tombstones', async () => {
    const created = WatchBandSchema.parse((await post(emc, base(), band('Pulled band', { lowerHz: 800e6, upperHz: 801e6 })).expect(201)).body);
    await emc.agent.delete(`${base()}/${created.id}`).set('Origin', TRUSTED_ORIGIN).expect(204);
    const changes = [];
    let cursor = '0';
    for (;;) {
      const page = PullResponseSchema.parse((await surveyor.agent.get(`/api/orgs/${orgId}/sync/pull`).query({ since: cursor, limit: 5000 }).expect(200)).body);
      changes.push(...page.changes.filter((c) => c.entity === 'watch_bands' && c.record.id === created.id));
      cursor = page.nextCursor;
      if (!page.hasMore) break;
    }
    expect(changes.length).toBeGreaterThan(0);
    expect(changes.at(-1)!.record).toMatchObject({ id: created.id, deleted: true });
  });
});
