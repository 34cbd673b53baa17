/**
 * The demo seed against the real database: idempotent, deterministic across fresh databases, every
 * synced row numbered by the organisation's counter, demo accounts that sign in, and readings that
 * follow the dipole law they were generated from.
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { and, eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDb, type Db } from '../../server/db/client';
import {
  attachments,
  changeLog,
  fieldReadings,
  flags,
  memberships,
  organisations,
  plans,
  stations,
  surveyAssignments,
  surveys,
  sweeps,
  SYNCED_ENTITIES,
  users,
} from '../../server/db/schema';
import { DEMO_PASSWORD, HARROWBY_ORG_ID, KESTREL_ORG_ID, seedDemo, type DemoSeedResult } from '../../server/db/seed/demo';
import { HARROWBY, HARROWBY_SOURCES, KESTREL } from '../../server/db/seed/demo-data';
import { demoId } from '../../server/db/seed/ids';
import { seedDemoFiles } from '../../server/db/seed/demo-files';
import { findTracePeaks } from '../../shared/emc/peaks';
import { parseTraceCsv } from '../../shared/emc/trace-csv';
import { attachmentObjectKey } from '../../shared/sync/attachment-key';
import { startTestStorage } from '../setup/test-app';
import { demoPlanDrawings, PLANS_DIR, renderPlanSvg } from '../../server/db/seed/plan-svg';
import { verifyPassword } from '../../server/features/auth/password';
import { createEmcRepository } from '../../server/features/emc/emc.repository';
import { createEmcService } from '../../server/features/emc/emc.service';
import { createEmcSweepsRepository } from '../../server/features/emc-sweeps/emc-sweeps.repository';
import { createEmcSweepsService } from '../../server/features/emc-sweeps/emc-sweeps.service';
import { createReviewRepository } from '../../server/features/review/review.repository';
import { createReviewService } from '../../server/features/review/review.service';
import { createRepeatsService } from '../../server/features/sync/repeats.service';
import { createSyncRepository } from '../../server/features/sync/sync.repository';
import { createLogger } from '../../server/lib/logger';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';

interface Opened {
  testDb: TestDatabase;
  db: Db;
  close: () => Promise<void>;
}

async function open(): Promise<Opened> {
  const testDb = await createTestDatabase();
  const { pool, db } = createDb(testDb.url, { max: 4 });
  return { testDb, db, close: () => pool.end() };
}

/** MD5 over every row of a table in id order, optionally without some columns. */
async function tableHash(db: Db, table: string, without: string[] = []): Promise<string> {
  const drop = without.map((c) => ` - '${c}'`).join('');
  const result = await db.execute<{ hash: string | null }>(
    sql.raw(`SELECT md5(coalesce(string_agg((to_jsonb(t)${drop})::text, '|' ORDER BY t.id::text), '')) AS hash FROM "${table}" t`),
  );
  return result.rows[0]!.hash ?? '';
}

async function snapshot(db: Db, without: string[] = []): Promise<Record<string, string>> {
  const tables = [...SYNCED_ENTITIES, 'organisations', 'memberships', 'change_log', 'audit_log'];
  const out: Record<string, string> = {};
  for (const table of tables) {
    const key = table === 'memberships' || table === 'change_log' ? `(SELECT *, ${table === 'memberships' ? "user_id::text || organisation_id::text" : "organisation_id::text || lpad(seq::text, 12, '0')"} AS id FROM "${table}")` : null;
    if (key) {
      const drop = without.map((c) => ` - '${c}'`).join('');
      const result = await db.execute<{ hash: string | null }>(
        sql.raw(`SELECT md5(coalesce(string_agg((to_jsonb(t)${drop})::text, '|' ORDER BY t.id), '')) AS hash FROM ${key} t`),
      );
      out[table] = result.rows[0]!.hash ?? '';
    } else if (table === 'audit_log') {
      // An audit row's before/after is the record as written, server timestamps included: those go too.
      const drop = [...without, 'at'].map((c) => ` - '${c}'`).join('');
      const body = without.length
        ? `(to_jsonb(t)${drop} - 'before' - 'after') || jsonb_build_object('before', t.before - 'createdAt' - 'updatedAt', 'after', t.after - 'createdAt' - 'updatedAt')`
        : `to_jsonb(t)${drop}`;
      const result = await db.execute<{ hash: string | null }>(sql.raw(`SELECT md5(coalesce(string_agg((${body})::text, '|' ORDER BY t.id::text), '')) AS hash FROM audit_log t`));
      out[table] = result.rows[0]!.hash ?? '';
    } else {
      out[table] = await tableHash(db, table, without);
    }
  }
  const people = await db.execute<{ hash: string }>(
    sql`SELECT md5(string_agg(id::text || email || name, '|' ORDER BY email)) AS hash FROM users`,
  );
  out.users = people.rows[0]!.hash;
  return out;
}

let first: Opened;
let second: Opened;
let result: DemoSeedResult;

beforeAll(async () => {
  [first, second] = await Promise.all([open(), open()]);
  result = await seedDemo(first.db);
});

afterAll(async () => {
  for (const o of [first, second]) {
    await o?.close();
    await o?.testDb.drop();
  }
});

describe('seedDemo', () => {
  it('creates the demo organisation and returns one user per role', async () => {
    expect(result.created).toBe(true);
    expect(result.organisationId).toBe(HARROWBY_ORG_ID);
    expect(Object.keys(result.users).sort()).toEqual(['admin', 'emc', 'reviewer', 'surveyor', 'viewer']);
    const roles = await first.db
      .select({ email: users.email, role: memberships.role })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(eq(memberships.organisationId, HARROWBY_ORG_ID));
    expect(roles.map((r) => `${r.role}:${r.email}`).sort()).toEqual(
      [
        'admin:admin@harrowby.example',
        'emc:emc@harrowby.example',
        'reviewer:reviewer@harrowby.example',
        'surveyor:surveyor2@harrowby.example',
        'surveyor:surveyor3@harrowby.example',
        'surveyor:surveyor@harrowby.example',
        'viewer:viewer@harrowby.example',
      ].sort(),
    );
  });

  it('gives every demo account the documented demo password, and only that one', async () => {
    await Promise.all(
      [...HARROWBY.people, ...KESTREL.people].map(async (person) => {
        const [row] = await first.db.select({ hash: users.passwordHash }).from(users).where(eq(users.email, person.email));
        expect(row, person.email).toBeDefined();
        expect(await verifyPassword(DEMO_PASSWORD, row!.hash), person.email).toBe(true);
        expect(await verifyPassword('fringewalk-demo!', row!.hash), person.email).toBe(false);
      }),
    );
  });

  it('changes nothing when run a second time', async () => {
    const before = await snapshot(first.db);
    const [orgBefore] = await first.db.select().from(organisations).where(eq(organisations.id, HARROWBY_ORG_ID));
    const again = await seedDemo(first.db);
    expect(again).toEqual({ ...result, created: false });
    expect(await snapshot(first.db)).toEqual(before);
    const [orgAfter] = await first.db.select().from(organisations).where(eq(organisations.id, HARROWBY_ORG_ID));
    expect(orgAfter).toEqual(orgBefore);
  });

  it('makes the same rows on a second fresh database, even with two seeders racing', async () => {
    const [a, b] = await Promise.all([seedDemo(second.db), seedDemo(second.db)]);
    expect([a.created, b.created].sort()).toEqual([false, true]);
    expect(a.users).toEqual(result.users);
    // Server timestamps (created_at, updated_at, audit `at`, and the createdAt / updatedAt of the records an
    // audit row holds) are the only values allowed to differ.
    const without = ['created_at', 'updated_at', 'at'];
    expect(await tableHash(second.db, 'field_readings', without)).toBe(await tableHash(first.db, 'field_readings', without));
    expect(await snapshot(second.db, without)).toEqual(await snapshot(first.db, without));
    const [count] = await second.db.select({ n: sql<number>`count(*)::int` }).from(organisations);
    expect(count!.n).toBe(2);
  });

  it('numbers every synced row from its organisation counter and logs each change once', async () => {
    for (const organisationId of [HARROWBY_ORG_ID, KESTREL_ORG_ID]) {
      const union = SYNCED_ENTITIES.map((t) => `SELECT '${t}' AS entity, id, change_seq, revision, deleted FROM "${t}" WHERE organisation_id = '${organisationId}'`).join(' UNION ALL ');
      const rows = (await first.db.execute<{ entity: string; id: string; change_seq: string; revision: number }>(sql.raw(union))).rows;
      const log = await first.db.select().from(changeLog).where(eq(changeLog.organisationId, organisationId)).orderBy(changeLog.seq);
      const [org] = await first.db.select({ changeSeq: organisations.changeSeq }).from(organisations).where(eq(organisations.id, organisationId));

      // Most rows are written once; a few are then changed by the server's own code (flags worked, surveys
      // signed off): one logged change per revision, the row carrying the sequence of its latest.
      const changes = rows.reduce((n, row) => n + row.revision, 0);
      expect(rows.length).toBeGreaterThan(0);
      expect(log.map((l) => l.seq)).toEqual(Array.from({ length: changes }, (_, i) => i + 1));
      expect(org!.changeSeq).toBe(changes);
      const logged = new Map<string, { seq: number; revisions: number[] }>();
      for (const l of log) {
        const key = `${l.entity}:${l.entityId}`;
        const entry = logged.get(key) ?? { seq: 0, revisions: [] };
        logged.set(key, { seq: l.seq, revisions: [...entry.revisions, l.revision] });
      }
      for (const row of rows) {
        const entry = logged.get(`${row.entity}:${row.id}`);
        expect(entry?.seq, `${row.entity} ${row.id}`).toBe(Number(row.change_seq));
        expect(entry?.revisions, `${row.entity} ${row.id}`).toEqual(Array.from({ length: row.revision }, (_, i) => i + 1));
      }
    }
  });

  it('seeds one open survey with its two surveyors assigned, and two signed-off surveys with every reading decided', async () => {
    const all = await first.db.select().from(surveys).where(eq(surveys.organisationId, HARROWBY_ORG_ID));
    expect(all.map((s) => s.state).sort()).toEqual(['open', 'signed_off', 'signed_off']);
    const open = all.find((s) => s.state === 'open')!;
    const assigned = await first.db
      .select()
      .from(surveyAssignments)
      .where(and(eq(surveyAssignments.surveyId, open.id), eq(surveyAssignments.role, 'surveyor')));
    const [onPhone] = await first.db.select({ id: users.id }).from(users).where(eq(users.email, 'surveyor3@harrowby.example'));
    expect(assigned.map((a) => a.userId).sort()).toEqual([result.users.surveyor, onPhone!.id].sort());

    for (const signed of all.filter((s) => s.state === 'signed_off')) {
      const undecided = await first.db.execute<{ n: number }>(sql`
        SELECT count(*)::int AS n FROM field_readings r
        WHERE r.survey_id = ${signed.id} AND NOT EXISTS (SELECT 1 FROM decisions d WHERE d.field_reading_id = r.id)`);
      expect(undecided.rows[0]!.n, signed.name).toBe(0);
    }
    const remeasure = await first.db.execute<{ n: number }>(sql`SELECT count(*)::int AS n FROM decisions WHERE survey_id = ${open.id} AND verdict = 'remeasure'`);
    expect(remeasure.rows[0]!.n).toBe(1);
  });

  it('keeps to a few hundred readings, with both entry forms and several units', async () => {
    const readings = await first.db.select().from(fieldReadings).where(eq(fieldReadings.organisationId, HARROWBY_ORG_ID));
    expect(readings.length).toBeGreaterThanOrEqual(150);
    expect(readings.length).toBeLessThanOrEqual(600);
    expect(readings.some((r) => r.magnitudeT !== null)).toBe(true);
    expect(readings.some((r) => r.bxT !== null)).toBe(true);
    expect(new Set(readings.map((r) => r.unit)).size).toBeGreaterThanOrEqual(3);
    const sweepRows = await first.db.select().from(sweeps).where(eq(sweeps.organisationId, HARROWBY_ORG_ID));
    expect(sweepRows.length).toBeGreaterThanOrEqual(2);
  });

  it('has an instrument whose calibration is overdue today, and others that are not', async () => {
    const rows = await first.db.execute<{ overdue: boolean }>(
      sql`SELECT calibration_due_on < current_date AS overdue FROM instruments WHERE organisation_id = ${HARROWBY_ORG_ID} AND kind = 'gaussmeter'`,
    );
    expect(rows.rows.map((r) => r.overdue).sort()).toEqual([false, true]);
  });

  it('follows the dipole law at the ECR tool ports, where the electron line falls in the 2.4 GHz ISM band', async () => {
    // Equatorial dipole field |B| = μ₀m/(4πr³) (Jackson, Classical Electrodynamics, 3rd ed., §5.6), with
    // μ₀ = 1.25663706212e-6 N/A² (CODATA 2018). At 0.5 m the other demo magnets add < 0.1 %.
    const ecr = HARROWBY_SOURCES.find((s) => s.key === 'ecr-coils')!;
    const mu0 = 1.25663706212e-6;
    const expectedT = (mu0 * ecr.dipoleMomentAM2) / (4 * Math.PI * 0.5 ** 3);
    const rows = await first.db
      .select({ fieldT: fieldReadings.fieldT, xM: stations.xM, yM: stations.yM, id: fieldReadings.id })
      .from(fieldReadings)
      .innerJoin(stations, eq(stations.id, fieldReadings.stationId))
      .where(and(eq(fieldReadings.surveyId, demoId('harrowby:survey:2026')), eq(stations.yM, ecr.yM)));
    const ports = rows.filter((r) => Math.abs(Math.abs(r.xM - ecr.xM) - 0.5) < 1e-9);
    expect(ports.length).toBeGreaterThanOrEqual(2);
    for (const port of ports) {
      // The Hall meter's 1 % uncertainty is the noise; 4 σ covers it.
      expect(Math.abs(port.fieldT! / expectedT - 1)).toBeLessThan(0.04);
      // Electron cyclotron ≈ 27.99 GHz/T (REFERENCES.md, CODATA 2018); ISM band 2400–2500 MHz (ITU RR 5.150).
      const lineHz = 27.99e9 * port.fieldT!;
      expect(lineHz).toBeGreaterThan(2.4e9);
      expect(lineHz).toBeLessThan(2.5e9);
    }
    const [sweep] = await first.db.select().from(sweeps).where(eq(sweeps.id, demoId('harrowby:survey:2026:sweep:etch')));
    const linePeak = sweep!.peaks.find((p) => p.frequencyHz !== 2.45e9)!;
    const [atStation] = await first.db.select({ fieldT: fieldReadings.fieldT }).from(fieldReadings).where(eq(fieldReadings.stationId, sweep!.stationId));
    expect(linePeak.frequencyHz / (27.99e9 * atStation!.fieldT!)).toBeCloseTo(1, 3);
  });

  it('stays near the Earth field on the roof, far from every magnet', async () => {
    // Earth's field is about 22–67 µT at the surface (REFERENCES.md, "Fringe fields").
    const rows = await first.db
      .select({ fieldT: fieldReadings.fieldT })
      .from(fieldReadings)
      .innerJoin(stations, eq(stations.id, fieldReadings.stationId))
      .where(eq(stations.levelId, demoId('harrowby:level:roof')));
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) {
      expect(r.fieldT!).toBeGreaterThan(22e-6);
      expect(r.fieldT!).toBeLessThan(67e-6);
    }
  });

  it('keeps the second organisation to itself', async () => {
    const kestrelUsers = await first.db.select({ userId: memberships.userId }).from(memberships).where(eq(memberships.organisationId, KESTREL_ORG_ID));
    expect(kestrelUsers).toHaveLength(1);
    const shared = await first.db.execute<{ n: number }>(sql`
      SELECT count(*)::int AS n FROM memberships a JOIN memberships b ON a.user_id = b.user_id
      WHERE a.organisation_id = ${HARROWBY_ORG_ID} AND b.organisation_id = ${KESTREL_ORG_ID}`);
    expect(shared.rows[0]!.n).toBe(0);
    const counts = await first.db.execute<{ sites: number; surveys: number }>(sql`
      SELECT (SELECT count(*)::int FROM sites WHERE organisation_id = ${KESTREL_ORG_ID}) AS sites,
             (SELECT count(*)::int FROM surveys WHERE organisation_id = ${KESTREL_ORG_ID}) AS surveys`);
    expect(counts.rows[0]).toEqual({ sites: 1, surveys: 0 });
  });

  it('records plan metadata that matches the committed plan files, which match their renderer', async () => {
    for (const drawing of demoPlanDrawings()) {
      const committed = fs.readFileSync(path.join(PLANS_DIR, drawing.fileName), 'utf8');
      expect(committed, `${drawing.fileName} is stale: run npx tsx server/db/seed/plan-svg.ts`).toBe(renderPlanSvg(drawing));
    }
    const rows = await first.db.select().from(plans);
    expect(rows).toHaveLength(demoPlanDrawings().length);
    for (const plan of rows) {
      const bytes = fs.readFileSync(path.join(PLANS_DIR, plan.originalName!));
      expect(plan.byteSize).toBe(bytes.length);
      expect(plan.sha256).toBe((await import('node:crypto')).createHash('sha256').update(bytes).digest('hex'));
      // 0.05 m per pixel × 960 px = 48 m, the plan width in demo-data.ts.
      expect(plan.metresPerPixel! * plan.widthPx).toBeCloseTo(48, 9);
    }
  });
  it('stores trace files for the etch and corridor sweeps like uploaded attachments, made again byte for byte on every start', async () => {
    const files = await startTestStorage();
    try {
      const rows = await first.db.select().from(sweeps).where(eq(sweeps.surveyId, demoId('harrowby:survey:2026')));
      const withTrace = rows.filter((r) => r.traceObjectKey !== null);
      expect(withTrace.map((r) => r.id).sort()).toEqual([demoId('harrowby:survey:2026:sweep:etch'), demoId('harrowby:survey:2026:sweep:corridor')].sort());
      const uploaded = await seedDemoFiles(first.db, files.storage);
      for (const sweep of withTrace) {
        // The key is the one the server derives for an upload (shared/sync/attachment-key.ts).
        expect(sweep.traceObjectKey).toBe(attachmentObjectKey(HARROWBY_ORG_ID, 'trace', sweep.id, sweep.traceSha256!));
        const [arrived] = await first.db.select().from(attachments).where(and(eq(attachments.organisationId, HARROWBY_ORG_ID), eq(attachments.objectKey, sweep.traceObjectKey!)));
        expect(arrived).toMatchObject({ entity: 'sweeps', recordId: sweep.id, kind: 'trace', sha256: sweep.traceSha256, contentType: 'text/csv' });
        expect(uploaded).toContain(sweep.traceObjectKey);
        const object = await files.storage.getObject(sweep.traceObjectKey!);
        const chunks: Buffer[] = [];
        for await (const chunk of object!.body) chunks.push(chunk as Buffer);
        const bytes = Buffer.concat(chunks);
        expect(bytes.length).toBe(arrived!.bytes);
        expect((await import('node:crypto')).createHash('sha256').update(bytes).digest('hex')).toBe(sweep.traceSha256);
        // The format the capture form accepts, spanning the sweep, with a peak at every marker (within a bin).
        const parsed = parseTraceCsv(bytes.toString('utf8'));
        expect(parsed.ok).toBe(true);
        if (!parsed.ok) continue;
        expect(parsed.unit).toBe('MHz');
        expect(parsed.trace.frequencyHz[0]).toBeCloseTo(sweep.startHz, 0);
        expect(parsed.trace.frequencyHz[parsed.trace.frequencyHz.length - 1]).toBeCloseTo(sweep.stopHz, 0);
        const bin = (sweep.stopHz - sweep.startHz) / (parsed.trace.frequencyHz.length - 1);
        const found = findTracePeaks(parsed.trace, { rbwHz: sweep.rbwHz }).peaks;
        expect(found).toHaveLength(sweep.peaks.length);
        for (const marker of sweep.peaks) expect(found.some((p) => Math.abs(p.frequencyHz - marker.frequencyHz) <= bin / 2 + 1)).toBe(true);
      }
      // A second start finds them there and uploads nothing.
      expect(await seedDemoFiles(first.db, files.storage)).toEqual([]);
    } finally {
      await files.close();
    }
  });
});

/**
 * RFC 8785 canonical JSON written independently of shared/review/canonical-json.ts (as in
 * review-signoff.test.ts): JSON.stringify with every object's keys re-inserted in sorted order
 * (JSON.stringify keeps insertion order for non-integer keys, and no key in the report is an integer).
 */
function independentCanonical(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) =>
    v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.keys(v as object).sort().map((k) => [k, (v as Record<string, unknown>)[k]])) : v,
  );
}

const silentLogger = () => createLogger('silent');
const noMail = { send: async () => {}, close: () => {} };
const openSurveyId = demoId('harrowby:survey:2026');

describe('the demo story', () => {
  it('has two signed-off surveys a year apart, each with a report hash that the report page verifies', async () => {
    const signed = (await first.db.select().from(surveys).where(and(eq(surveys.organisationId, HARROWBY_ORG_ID), eq(surveys.state, 'signed_off')))).sort((a, b) => a.signedOffAt!.getTime() - b.signedOffAt!.getTime());
    expect(signed).toHaveLength(2);
    const days = (signed[1]!.signedOffAt!.getTime() - signed[0]!.signedOffAt!.getTime()) / 86_400_000;
    expect(days).toBeGreaterThan(330);
    expect(days).toBeLessThan(400);
    const review = createReviewService({ repo: createReviewRepository(first.db), mailer: noMail, publicUrl: 'http://localhost', logger: silentLogger() });
    for (const survey of signed) {
      expect(survey.reportSha256, survey.name).toMatch(/^[0-9a-f]{64}$/);
      const report = await review.report(HARROWBY_ORG_ID, survey.id);
      // SHA-256 (node:crypto) of the canonical JSON of the report's data as served now is the one recorded.
      expect(createHash('sha256').update(independentCanonical(report.data), 'utf8').digest('hex'), survey.name).toBe(survey.reportSha256);
      expect(report.dataSha256).toBe(survey.reportSha256);
      expect(report.status.signedOffBy?.userId).toBe(result.users.reviewer);
      // Made by more than one surveyor, on more than one device; with the survey's flags in the signed report.
      expect(new Set(report.data.readings.map((r) => r.surveyorUserId)).size, survey.name).toBeGreaterThanOrEqual(2);
      expect(report.data.flags.length, survey.name).toBeGreaterThan(0);
      expect(report.data.readings.every((r) => r.decision && r.decision.verdict !== 'remeasure'), survey.name).toBe(true);
      const audit = await first.db.execute<{ actor_user_id: string }>(sql`SELECT actor_user_id FROM audit_log WHERE entity = 'surveys' AND entity_id = ${survey.id} AND action = 'sign_off'`);
      expect(audit.rows.map((r) => r.actor_user_id)).toEqual([result.users.reviewer]);
    }
    // The magnets were there per their installation dates: the ECR tool (2026) is in neither signed survey.
    const ecr = HARROWBY_SOURCES.find((s) => s.key === 'ecr-coils')!;
    expect(signed.every((s) => s.signedOffAt!.toISOString().slice(0, 10) < ecr.installedOn)).toBe(true);
  });

  it('has the open survey walked by two surveyors on two devices', async () => {
    const rows = await first.db.execute<{ surveyors: number; devices: number }>(sql`
      SELECT count(DISTINCT r.surveyor_user_id)::int AS surveyors, count(DISTINCT w.device_id)::int AS devices
      FROM field_readings r JOIN walks w ON w.id = r.walk_id WHERE r.survey_id = ${openSurveyId}`);
    expect(rows.rows[0]!.surveyors).toBeGreaterThanOrEqual(2);
    expect(rows.rows[0]!.devices).toBeGreaterThanOrEqual(2);
  });

  it('has sweeps whose peaks the predicted lines explain, and at least one peak they do not', async () => {
    const files = await startTestStorage();
    try {
      const service = createEmcSweepsService({ repo: createEmcSweepsRepository(first.db), storage: files.storage, logger: silentLogger() });
      const list = await service.list(HARROWBY_ORG_ID, openSurveyId);
      expect(list.reduce((n, s) => n + s.markerCounts.explained, 0)).toBeGreaterThanOrEqual(1);
      expect(list.reduce((n, s) => n + s.markerCounts.unexplained, 0)).toBeGreaterThanOrEqual(1);
    } finally {
      await files.close();
    }
  });

  it('has open, acknowledged and resolved EMC flags on the open survey, worked by the EMC engineer with audit rows', async () => {
    const rows = await first.db.select().from(flags).where(and(eq(flags.surveyId, openSurveyId), eq(flags.deleted, false)));
    const states = new Set(rows.map((f) => f.state));
    expect([...states].sort()).toEqual(['acknowledged', 'open', 'resolved']);
    for (const flag of rows.filter((f) => f.state !== 'open')) {
      expect(flag.acknowledgedByUserId).toBe(result.users.emc);
      expect(flag.acknowledgementNote).toMatch(/Demo data/);
      const actions = await first.db.execute<{ action: string; actor_user_id: string }>(sql`SELECT action, actor_user_id FROM audit_log WHERE entity = 'flags' AND entity_id = ${flag.id} AND action IN ('acknowledge', 'resolve') ORDER BY id`);
      expect(actions.rows).toEqual(flag.state === 'resolved' ? [{ action: 'acknowledge', actor_user_id: result.users.emc }, { action: 'resolve', actor_user_id: result.users.emc }] : [{ action: 'acknowledge', actor_user_id: result.users.emc }]);
      if (flag.state === 'resolved') expect(flag.resolution).toMatch(/Demo data/);
    }
  });

  it('has exactly one disagreeing repeat group in the open survey, at the reading the reviewer asked to re-measure', async () => {
    const repeats = createRepeatsService({ repo: createSyncRepository(first.db), logger: silentLogger() });
    try {
      const { groups } = await repeats.list(HARROWBY_ORG_ID, openSurveyId);
      expect(groups.length).toBeGreaterThan(1);
      const disagreeing = groups.filter((g) => g.disagree);
      expect(disagreeing).toHaveLength(1);
      const remeasure = await first.db.execute<{ field_reading_id: string }>(sql`SELECT field_reading_id FROM decisions WHERE survey_id = ${openSurveyId} AND verdict = 'remeasure'`);
      expect(disagreeing[0]!.readingIds).toContain(remeasure.rows[0]!.field_reading_id);
      // Eₙ = |B₁ − B₂| / √(U₁² + U₂²) with U = k·u·B, k = 2 (ISO 13528 and the GUM, recalled): above 1.
      const members = await first.db.execute<{ field_t: number; u: number }>(sql`
        SELECT r.field_t, i.relative_uncertainty AS u FROM field_readings r JOIN instruments i ON i.id = r.instrument_id WHERE r.id IN ${sql.raw(`('${disagreeing[0]!.readingIds.join("','")}')`)}`);
      const [a, b] = members.rows.sort((x, y) => x.field_t - y.field_t).filter((_, i, all) => i === 0 || i === all.length - 1);
      const en = Math.abs(b!.field_t - a!.field_t) / Math.hypot(2 * a!.u * a!.field_t, 2 * b!.u * b!.field_t);
      expect(en).toBeGreaterThan(1);
    } finally {
      await repeats.close();
    }
  });

  it('leaves the flag job nothing to change', async () => {
    const before = await snapshot(first.db, ['created_at', 'updated_at', 'at']);
    const emc = createEmcService({ repo: createEmcRepository(first.db), mailer: noMail, publicUrl: 'http://localhost', logger: silentLogger() });
    for (const survey of await first.db.select({ id: surveys.id }).from(surveys).where(eq(surveys.organisationId, HARROWBY_ORG_ID))) {
      expect(await emc.recompute(HARROWBY_ORG_ID, survey.id)).toEqual({ created: 0, updated: 0, withdrawn: 0 });
    }
    expect((await snapshot(first.db, ['created_at', 'updated_at', 'at'])).flags).toBe(before.flags);
  });
});
