/**
 * Every API route, once, with the status each role must get (and a signed-out caller). The test
 * walks the app's router stack: a route registered but missing here — or listed here but not
 * registered — fails the test, so a new route cannot ship without saying who may use it.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../shared/schemas/common';
import { seedDemo } from '../../server/db/seed/demo';
import { demoId } from '../../server/db/seed/ids';
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
  /** Site-setup records made for the matrix (issue 6), and a way to make fresh ones as the admin. */
  setup: SetupContext;
}

interface SetupContext {
  levelId: string;
  /** A level of its own for the upload row (each upload replaces the level's current plan). */
  uploadLevelId: string;
  planId: string;
  roomId: string;
  sourceId: string;
  emitterId: string;
  instrumentId: string;
  antennaId: string;
  /** POSTs as the demo admin and returns the answer's id (for rows that use up what they touch). */
  create(path: string, body: object): Promise<string>;
}

const WRITERS: Role[] = ['admin', 'reviewer'];
const writer = (who: Who) => who === 'admin' || who === 'reviewer';
const BAND_KEEPERS: Role[] = ['emc', 'admin'];
let mriScanners = 0;
const MATRIX_FLAG_ID = '00000000-0000-7000-8000-00000000f1a9';
const matrixBand = (name: string) => ({ name, lowerHz: 700e6, upperHz: 701e6, reason: 'Matrix', source: 'Invented test data', severity: 'low' });
const ANTENNA_CSV = Buffer.from('frequency_mhz,antenna_factor_db_per_m\n30,18.2\n300,14.1\n');

interface Prepared {
  body?: unknown;
  params?: Record<string, string>;
  /** A multipart upload instead of a JSON body. */
  attach?: { field: string; bytes: Buffer; filename: string };
}

interface Row {
  method: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  path: string;
  expect: Statuses;
  /** Per-call body and/or parameter overrides. */
  prepare?: (ctx: Context, who: Who) => Promise<Prepared> | Prepared;
  /** The call ends or replaces the session: give it a session of its own. */
  fresh?: boolean;
}

const MATRIX_SVG = Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="120" height="60"><rect width="120" height="60" fill="#eee"/></svg>');

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
  // surveys[0] is the open 2026 survey, to which the demo surveyor is assigned (an unassigned surveyor gets 403: offline-bundle.test.ts).
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/offline', expect: only(['admin', 'reviewer', 'surveyor']) },
  { method: 'GET', path: '/api/orgs/:orgId/audit', expect: only(['admin']) },
  // Sync (issue 5): push by those who capture or review (per-mutation answers inside the 200), pull by every member,
  // conflicts by reviewers and admins; a made-up conflict, record or empty payload exercises the guards only.
  {
    method: 'POST',
    path: '/api/orgs/:orgId/sync/push',
    expect: only(['admin', 'reviewer', 'surveyor']),
    prepare: (ctx) => ({
      body: {
        deviceId: 'matrix-device',
        mutations: [{ mutationId: crypto.randomUUID(), entity: 'stations', recordId: crypto.randomUUID(), surveyId: ctx.surveyId, baseRevision: 0, payload: {}, queuedAt: '2026-11-18T09:00:00.000Z' }],
      },
    }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/sync/pull', expect: members(200) },
  { method: 'GET', path: '/api/orgs/:orgId/sync/conflicts', expect: only(['admin', 'reviewer']) },
  {
    method: 'POST',
    path: '/api/orgs/:orgId/sync/conflicts/:conflictId/resolve',
    expect: only(['admin', 'reviewer'], 404),
    prepare: () => ({ params: { conflictId: '00000000-0000-7000-8000-00000000c0f1' }, body: { choose: 'server' } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/repeats', expect: members(200) },
  // Survey maps (issue 7 §1–2, §6): admins, reviewers, EMC engineers, and surveyors assigned to the survey (the demo surveyor is, to surveys[0]).
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/map', expect: only(['admin', 'reviewer', 'emc', 'surveyor']) },
  // Without ?with= the guards pass and the query is refused (the comparison itself: survey-map.test.ts).
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/compare', expect: only(['admin', 'reviewer', 'emc', 'surveyor'], 400) },
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/exports/survey.geojson', expect: only(['admin', 'reviewer', 'emc', 'surveyor']) },
  // Sweeps explained (issue 8 §4): every member reads them (emc-sweeps.test.ts has the content).
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/sweeps', expect: members(200) },
  {
    method: 'GET',
    path: '/api/orgs/:orgId/surveys/:surveyId/sweeps/:sweepId/explained',
    expect: members(200),
    prepare: () => ({ params: { surveyId: demoId('harrowby:survey:2026'), sweepId: demoId('harrowby:survey:2026:sweep:etch') } }),
  },
  // JSON is not a photo: the guards pass, then the content type is refused.
  {
    method: 'PUT',
    path: '/api/orgs/:orgId/attachments/:recordId/:kind',
    expect: only(['admin', 'reviewer', 'surveyor'], 415),
    prepare: () => ({ params: { recordId: '00000000-0000-7000-8000-0000000a77a1', kind: 'photo' }, body: { not: 'a photo' } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/attachments/:recordId/:kind', expect: members(404), prepare: () => ({ params: { recordId: '00000000-0000-7000-8000-0000000a77a1', kind: 'photo' } }) },
  // Site setup (issue 6): read by every member; written by admins and reviewers (instruments: admins; antenna tables: admins and EMC engineers).
  { method: 'POST', path: '/api/orgs/:orgId/sites', expect: only(WRITERS, 201), prepare: (ctx) => ({ body: { name: ctx.unique() } }) },
  { method: 'PATCH', path: '/api/orgs/:orgId/sites/:siteId', expect: only(WRITERS), prepare: () => ({ body: { notes: 'Matrix note.' } }) },
  { method: 'POST', path: '/api/orgs/:orgId/sites/:siteId/archive', expect: only(WRITERS), prepare: async (ctx) => ({ params: { siteId: await ctx.setup.create('/sites', { name: ctx.unique() }) } }) },
  { method: 'POST', path: '/api/orgs/:orgId/sites/:siteId/unarchive', expect: only(WRITERS) },
  { method: 'GET', path: '/api/orgs/:orgId/sites/:siteId/levels', expect: members(200) },
  { method: 'POST', path: '/api/orgs/:orgId/sites/:siteId/levels', expect: only(WRITERS, 201), prepare: (ctx) => ({ body: { name: ctx.unique(), ordinal: 9 } }) },
  { method: 'PATCH', path: '/api/orgs/:orgId/levels/:levelId', expect: only(WRITERS), prepare: (ctx) => ({ params: { levelId: ctx.setup.levelId }, body: { elevationM: 3 } }) },
  {
    method: 'POST',
    path: '/api/orgs/:orgId/levels/:levelId/plans',
    expect: only(WRITERS, 201),
    prepare: (ctx) => ({ params: { levelId: ctx.setup.uploadLevelId }, attach: { field: 'file', bytes: MATRIX_SVG, filename: 'plan.svg' } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/plans/:planId', expect: members(200), prepare: (ctx) => ({ params: { planId: ctx.setup.planId } }) },
  { method: 'GET', path: '/api/orgs/:orgId/plans/:planId/image', expect: members(200), prepare: (ctx) => ({ params: { planId: ctx.setup.planId } }) },
  {
    method: 'PUT',
    path: '/api/orgs/:orgId/plans/:planId/calibration',
    expect: only(WRITERS),
    prepare: (ctx) => ({ params: { planId: ctx.setup.planId }, body: { pointA: { xPx: 0, yPx: 0 }, pointB: { xPx: 100, yPx: 0 }, distanceM: 5, origin: { xPx: 0, yPx: 60 }, northAngleDeg: 0 } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/levels/:levelId/rooms', expect: members(200), prepare: (ctx) => ({ params: { levelId: ctx.setup.levelId } }) },
  {
    method: 'POST',
    path: '/api/orgs/:orgId/levels/:levelId/rooms',
    expect: only(WRITERS, 201),
    prepare: (ctx) => ({ params: { levelId: ctx.setup.levelId }, body: { name: ctx.unique(), polygonM: [[20, 20], [21, 20], [21, 21]] } }),
  },
  { method: 'PATCH', path: '/api/orgs/:orgId/rooms/:roomId', expect: only(WRITERS), prepare: (ctx) => ({ params: { roomId: ctx.setup.roomId }, body: { sensitivity: 'medium' } }) },
  {
    method: 'DELETE',
    path: '/api/orgs/:orgId/rooms/:roomId',
    expect: only(WRITERS),
    prepare: async (ctx, who) => ({
      params: { roomId: writer(who) ? await ctx.setup.create(`/levels/${ctx.setup.levelId}/rooms`, { name: ctx.unique(), polygonM: [[30, 30], [31, 30], [31, 31]] }) : ctx.setup.roomId },
    }),
  },
  // Watch bands (issue 8 §1): read by every member; kept by EMC engineers and admins.
  { method: 'GET', path: '/api/orgs/:orgId/watch-bands', expect: members(200) },
  { method: 'POST', path: '/api/orgs/:orgId/watch-bands', expect: only(BAND_KEEPERS, 201), prepare: (ctx) => ({ body: matrixBand(ctx.unique()) }) },
  { method: 'GET', path: '/api/orgs/:orgId/watch-bands/export.csv', expect: members(200) },
  {
    method: 'POST',
    path: '/api/orgs/:orgId/watch-bands/import',
    expect: only(BAND_KEEPERS),
    prepare: (ctx) => ({ body: { mode: 'all', csv: `name,lower_MHz,upper_MHz,reason,source,severity\n${ctx.unique()},700,701,Matrix,Invented,low\n` } }),
  },
  { method: 'POST', path: '/api/orgs/:orgId/watch-bands/starter-set', expect: only(BAND_KEEPERS) },
  {
    method: 'PATCH',
    path: '/api/orgs/:orgId/watch-bands/:watchBandId',
    expect: only(BAND_KEEPERS),
    prepare: async (ctx) => ({ params: { watchBandId: await ctx.setup.create('/watch-bands', matrixBand(ctx.unique())) }, body: { severity: 'high' } }),
  },
  {
    method: 'DELETE',
    path: '/api/orgs/:orgId/watch-bands/:watchBandId',
    expect: only(BAND_KEEPERS, 204),
    prepare: async (ctx) => ({ params: { watchBandId: await ctx.setup.create('/watch-bands', matrixBand(ctx.unique())) } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/sites/:siteId/mri-bands', expect: members(200) },
  {
    method: 'POST',
    path: '/api/orgs/:orgId/sites/:siteId/mri-bands/:sourceId',
    expect: only(BAND_KEEPERS, 201),
    // A fresh scanner of a field of its own each time: a receive band (same edges) can be added once.
    prepare: async (ctx) => ({ params: { sourceId: await ctx.setup.create(`/sites/${ctx.siteId}/sources`, { name: ctx.unique(), kind: 'mri', nominalFieldT: 1 + (mriScanners += 1) / 10 }) } }),
  },
  // EMC (issue 8 §2–§3): predictions and flags read by every member; flags worked by EMC engineers and admins
  // (a made-up flag: the guards pass, then 404 — the life of a real flag: emc-flags.test.ts).
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/emc/rooms', expect: members(200) },
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/emc/flags', expect: members(200) },
  { method: 'POST', path: '/api/orgs/:orgId/flags/:flagId/acknowledge', expect: only(BAND_KEEPERS, 404), prepare: () => ({ params: { flagId: MATRIX_FLAG_ID }, body: { note: 'Matrix.' } }) },
  { method: 'POST', path: '/api/orgs/:orgId/flags/:flagId/resolve', expect: only(BAND_KEEPERS, 404), prepare: () => ({ params: { flagId: MATRIX_FLAG_ID }, body: { resolution: 'Matrix.' } }) },
  { method: 'GET', path: '/api/orgs/:orgId/sites/:siteId/sources', expect: members(200) },
  { method: 'POST', path: '/api/orgs/:orgId/sites/:siteId/sources', expect: only(WRITERS, 201), prepare: (ctx) => ({ body: { name: ctx.unique(), kind: 'other', nominalFieldT: 0.5 } }) },
  { method: 'PATCH', path: '/api/orgs/:orgId/sources/:sourceId', expect: only(WRITERS), prepare: (ctx) => ({ params: { sourceId: ctx.setup.sourceId }, body: { notes: 'Matrix.' } }) },
  {
    method: 'DELETE',
    path: '/api/orgs/:orgId/sources/:sourceId',
    expect: only(WRITERS, 204),
    prepare: async (ctx, who) => ({
      params: { sourceId: writer(who) ? await ctx.setup.create(`/sites/${ctx.siteId}/sources`, { name: ctx.unique(), kind: 'other', nominalFieldT: 0.5 }) : ctx.setup.sourceId },
    }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/sites/:siteId/emitters', expect: members(200) },
  {
    method: 'POST',
    path: '/api/orgs/:orgId/sites/:siteId/emitters',
    expect: only(WRITERS, 201),
    prepare: (ctx) => ({ body: { roomId: ctx.setup.roomId, name: ctx.unique(), kind: 'other', electronDensityPerM3: 1e15, electronEnergyEv: 2, energyKind: 'total', volumeM3: 1e-4 } }),
  },
  { method: 'PATCH', path: '/api/orgs/:orgId/emitters/:emitterId', expect: only(WRITERS), prepare: (ctx) => ({ params: { emitterId: ctx.setup.emitterId }, body: { volumeM3: 2e-4 } }) },
  {
    method: 'DELETE',
    path: '/api/orgs/:orgId/emitters/:emitterId',
    expect: only(WRITERS, 204),
    prepare: async (ctx, who) => ({
      params: {
        emitterId: writer(who)
          ? await ctx.setup.create(`/sites/${ctx.siteId}/emitters`, { roomId: ctx.setup.roomId, name: ctx.unique(), kind: 'other', electronDensityPerM3: 1e15, electronEnergyEv: 2, energyKind: 'total', volumeM3: 1e-4 })
          : ctx.setup.emitterId,
      },
    }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/instruments', expect: members(200) },
  { method: 'POST', path: '/api/orgs/:orgId/instruments', expect: only(['admin'], 201), prepare: (ctx) => ({ body: { kind: 'analyser', model: 'Matrix analyser', serial: ctx.unique() } }) },
  { method: 'GET', path: '/api/orgs/:orgId/instruments/:instrumentId', expect: members(200), prepare: (ctx) => ({ params: { instrumentId: ctx.setup.instrumentId } }) },
  { method: 'PATCH', path: '/api/orgs/:orgId/instruments/:instrumentId', expect: only(['admin']), prepare: (ctx) => ({ params: { instrumentId: ctx.setup.instrumentId }, body: { notes: 'Matrix.' } }) },
  {
    method: 'PUT',
    path: '/api/orgs/:orgId/instruments/:instrumentId/antenna-factors',
    expect: only(['admin', 'emc']),
    prepare: (ctx) => ({ params: { instrumentId: ctx.setup.antennaId }, attach: { field: 'file', bytes: ANTENNA_CSV, filename: 'af.csv' } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/instruments/:instrumentId/antenna-factors', expect: members(200), prepare: (ctx) => ({ params: { instrumentId: ctx.setup.antennaId } }) },
  { method: 'GET', path: '/api/orgs/:orgId/zone-sets', expect: members(200) },
  { method: 'POST', path: '/api/orgs/:orgId/sites/:siteId/surveys', expect: only(WRITERS, 201), prepare: (ctx) => ({ body: { name: ctx.unique() } }) },
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/settings', expect: members(200) },
  // A survey of the matrix's own for the writes, so the demo survey's team (used by the offline row) stays as seeded.
  {
    method: 'PATCH',
    path: '/api/orgs/:orgId/surveys/:surveyId',
    expect: only(WRITERS),
    prepare: async (ctx) => ({ params: { surveyId: await ctx.setup.create(`/sites/${ctx.siteId}/surveys`, { name: ctx.unique() }) }, body: { maxHarmonic: 2 } }),
  },
  {
    method: 'PUT',
    path: '/api/orgs/:orgId/surveys/:surveyId/assignments',
    expect: only(WRITERS),
    prepare: async (ctx) => ({ params: { surveyId: await ctx.setup.create(`/sites/${ctx.siteId}/surveys`, { name: ctx.unique() }) }, body: { surveyors: [], reviewers: [] } }),
  },
  { method: 'GET', path: '/api/orgs/:orgId/sites/:siteId/audit', expect: only(['admin']) },
  // Review (issue 7 §3–7): the table, decisions, sign-off and import for reviewers and admins; report and CSV for every member.
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/review/readings', expect: only(WRITERS) },
  {
    method: 'POST',
    path: '/api/orgs/:orgId/surveys/:surveyId/decisions',
    expect: only(WRITERS, 404),
    prepare: () => ({ body: { readingIds: ['00000000-0000-7000-8000-0000000dec1d'], verdict: 'accepted' } }),
  },
  // A fresh survey per call (submitting closes it); the demo surveyor is not on its team, so 403 NOT_ASSIGNED.
  {
    method: 'POST',
    path: '/api/orgs/:orgId/surveys/:surveyId/submit',
    expect: only(WRITERS),
    prepare: async (ctx) => ({ params: { surveyId: await ctx.setup.create(`/sites/${ctx.siteId}/surveys`, { name: ctx.unique() }) } }),
  },
  // The demo survey is open: signing off and reopening are refused after the guards.
  { method: 'POST', path: '/api/orgs/:orgId/surveys/:surveyId/sign-off', expect: only(WRITERS, 409) },
  { method: 'POST', path: '/api/orgs/:orgId/surveys/:surveyId/reopen', expect: only(WRITERS, 409), prepare: () => ({ body: { reason: 'Matrix.' } }) },
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/report', expect: members(200) },
  { method: 'GET', path: '/api/orgs/:orgId/surveys/:surveyId/exports/readings.csv', expect: members(200) },
  // JSON is not a CSV: the guards pass, then the content type is refused.
  { method: 'POST', path: '/api/orgs/:orgId/surveys/:surveyId/imports/readings', expect: only(WRITERS, 415), prepare: () => ({ body: { csv: 'not a file' } }) },
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
    const create = async (path: string, body: object): Promise<string> => {
      const res = await admin.agent.post(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      return (res.body.room ?? res.body).id as string;
    };
    const siteId: string = sites.body.sites[0].id;
    const levelId = await create(`/sites/${siteId}/levels`, { name: 'Matrix level', ordinal: 50 });
    const plan = await admin.agent.post(`/api/orgs/${orgId}/levels/${levelId}/plans`).set('Origin', TRUSTED_ORIGIN).attach('file', MATRIX_SVG, 'matrix.svg').expect(201);
    const roomId = await create(`/levels/${levelId}/rooms`, { name: 'Matrix room', polygonM: [[0, 0], [4, 0], [4, 4], [0, 4]] });
    const antennaId = await create('/instruments', { kind: 'antenna', model: 'Matrix antenna', serial: unique() });
    await admin.agent.put(`/api/orgs/${orgId}/instruments/${antennaId}/antenna-factors`).set('Origin', TRUSTED_ORIGIN).attach('file', ANTENNA_CSV, 'af.csv').expect(200);
    const setup: SetupContext = {
      levelId,
      uploadLevelId: await create(`/sites/${siteId}/levels`, { name: 'Matrix upload level', ordinal: 51 }),
      planId: plan.body.id,
      roomId,
      sourceId: await create(`/sites/${siteId}/sources`, { name: 'Matrix magnet', kind: 'other', nominalFieldT: 0.5 }),
      emitterId: await create(`/sites/${siteId}/emitters`, { roomId, name: 'Matrix emitter', kind: 'other', electronDensityPerM3: 1e15, electronEnergyEv: 2, energyKind: 'total', volumeM3: 1e-4 }),
      instrumentId: await create('/instruments', { kind: 'analyser', model: 'Matrix analyser', serial: unique() }),
      antennaId,
      create,
    };
    ctx = {
      setup,
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
      const verb = row.method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
      let req = verb === 'get' ? request(t.app).get(url) : request(t.app)[verb](url).set('Origin', TRUSTED_ORIGIN);
      if (cookie) req = req.set('Cookie', cookie);
      const res =
        verb === 'get'
          ? await req
          : prepared.attach
            ? await req.attach(prepared.attach.field, prepared.attach.bytes, prepared.attach.filename)
            : await req.send((prepared.body ?? {}) as object);
      got[who] = res.status;
      if (res.status >= 400) expect(res.body?.error?.code, `${who}: ${JSON.stringify(res.body)}`).toMatch(/^[A-Z_]+$/);
    }
    expect(got).toEqual(row.expect);
  });
});
