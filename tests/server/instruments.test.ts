/**
 * Instruments: create/read/update/archive with role checks, calibrationOverdue computed when read,
 * antenna-factor CSV upload (papaparse) with row-numbered refusals, and the calibration reminder mail
 * read back from the local SMTP capture, sent once per instrument per due date.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createInstrumentsRepository } from '../../server/features/instruments/instruments.repository';
import { createInstrumentsService } from '../../server/features/instruments/instruments.service';
import { seedDemo } from '../../server/db/seed/demo';
import { createMailer } from '../../server/lib/mail';
import { AntennaFactorTableSchema, InstrumentSchema } from '../../shared/schemas/instrument';
import { countRows, demoEmail, expectError, signIn, type SignedIn } from '../setup/api-helpers';
import { createTestApp, RELAXED_RATE_LIMITS, testLogger, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

const todayUtc = () => new Date().toISOString().slice(0, 10);
const daysFromToday = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

describe('instruments', () => {
  let t: InProcessApp;
  let admin: SignedIn;
  let emc: SignedIn;
  let viewer: SignedIn;
  let orgId: string;

  const post = (who: SignedIn, path: string, body: object) => who.agent.post(`/api/orgs/${orgId}${path}`).set('Origin', TRUSTED_ORIGIN).send(body);
  const uploadCsv = (who: SignedIn, id: string, csv: string) =>
    who.agent.put(`/api/orgs/${orgId}/instruments/${id}/antenna-factors`).set('Origin', TRUSTED_ORIGIN).attach('file', Buffer.from(csv), { filename: 'af.csv', contentType: 'text/csv' });

  beforeAll(async () => {
    t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
    admin = await signIn(t.app, demoEmail('admin'));
    emc = await signIn(t.app, demoEmail('emc'));
    viewer = await signIn(t.app, demoEmail('viewer'));
    orgId = admin.session.memberships[0]!.organisationId;
  });
  afterAll(async () => {
    await t?.close();
  });

  it('creates a gaussmeter (admin only), marks it overdue when its due date has passed, and archives it', async () => {
    const body = { kind: 'gaussmeter', model: 'Test Hall meter', serial: 'GM-T-001', probe: '3-axis Hall', calibratedOn: '2024-01-10', calibrationDueOn: '2025-01-10', relativeUncertainty: 0.02 };
    expectError(await post(emc, '/instruments', body), 403, 'FORBIDDEN');
    const created = InstrumentSchema.parse((await post(admin, '/instruments', body).expect(201)).body);
    expect(created).toMatchObject({ serial: 'GM-T-001', calibrationOverdue: true, calibrationDueSoon: false, archived: false, antennaFactors: null });
    expectError(await post(admin, '/instruments', body), 409, 'CONFLICT');
    const recalibrated = InstrumentSchema.parse(
      (await admin.agent.patch(`/api/orgs/${orgId}/instruments/${created.id}`).set('Origin', TRUSTED_ORIGIN).send({ calibratedOn: todayUtc(), calibrationDueOn: daysFromToday(365) }).expect(200)).body,
    );
    expect(recalibrated).toMatchObject({ calibrationOverdue: false, revision: 2 });
    const archived = InstrumentSchema.parse((await admin.agent.patch(`/api/orgs/${orgId}/instruments/${created.id}`).set('Origin', TRUSTED_ORIGIN).send({ archived: true }).expect(200)).body);
    expect(archived.archived).toBe(true);
    const listed = (await viewer.agent.get(`/api/orgs/${orgId}/instruments`).expect(200)).body.instruments;
    expect(listed.find((i: { id: string }) => i.id === created.id).archived).toBe(true);
    expect(await countRows(t.databaseUrl, 'audit_log', `entity = 'instruments' AND entity_id = '${created.id}'`)).toBe(3);
  });

  it('requires an uncertainty for gaussmeters and refuses a due date before the calibration date', async () => {
    const noU = await post(admin, '/instruments', { kind: 'gaussmeter', model: 'M', serial: 'X1' });
    expectError(noU, 400, 'VALIDATION_FAILED');
    expect(noU.body.error.details.issues[0].path).toBe('relativeUncertainty');
    const backwards = await post(admin, '/instruments', { kind: 'analyser', model: 'M', serial: 'X2', calibratedOn: '2026-05-01', calibrationDueOn: '2026-04-01' });
    expectError(backwards, 400, 'VALIDATION_FAILED');
    expect(backwards.body.error.details.issues[0].path).toBe('calibrationDueOn');
  });

  it('stores an antenna-factor table from CSV (admin or EMC engineer) and lists bad rows by number', async () => {
    const antenna = InstrumentSchema.parse((await post(admin, '/instruments', { kind: 'antenna', model: 'Test biconical', serial: 'ANT-T-9' }).expect(201)).body);
    const bad = await uploadCsv(emc, antenna.id, 'Frequency (MHz),Antenna factor (dB/m)\n30,18.2\n40,x\n25,11\n');
    expectError(bad, 400, 'ANTENNA_FACTORS_INVALID');
    expect(bad.body.error.details.rows).toEqual([
      { row: 3, message: 'The antenna factor "x" is not a number.' },
      { row: 4, message: expect.stringMatching(/increase/) },
    ]);
    expect(bad.body.error.message).toMatch(/row 3/);
    expect(await t.storage.listKeys(`orgs/${orgId}/instruments/${antenna.id}/`)).toEqual([]);
    expectError(await uploadCsv(viewer, antenna.id, '30,18\n40,19\n'), 403, 'FORBIDDEN');

    const ok = InstrumentSchema.parse((await uploadCsv(emc, antenna.id, 'Frequency (MHz),Antenna factor (dB/m)\n30,18.2\n100,9.6\n300,14.1\n').expect(200)).body);
    expect(ok.antennaFactors).toEqual({ points: 3, minFrequencyMHz: 30, maxFrequencyMHz: 300 });
    const table = AntennaFactorTableSchema.parse((await viewer.agent.get(`/api/orgs/${orgId}/instruments/${antenna.id}/antenna-factors`).expect(200)).body);
    expect(table.points[1]).toEqual({ frequencyMHz: 100, antennaFactorDbPerM: 9.6 });
    expect((await t.storage.listKeys(`orgs/${orgId}/instruments/${antenna.id}/`)).length).toBe(1);

    const gaussmeter = (await viewer.agent.get(`/api/orgs/${orgId}/instruments`).expect(200)).body.instruments.find((i: { kind: string }) => i.kind === 'gaussmeter');
    expectError(await uploadCsv(admin, gaussmeter.id, '30,18\n40,19\n'), 409, 'CONFLICT');
  });

  describe('calibration reminders', () => {
    it('mails the admins about instruments due within 14 days of the given day, once per due date', async () => {
      const now = new Date('2031-03-01T08:00:00Z');
      const due = InstrumentSchema.parse((await post(admin, '/instruments', { kind: 'analyser', model: 'Reminder analyser', serial: 'RA-1', calibrationDueOn: '2031-03-10' }).expect(201)).body);
      const later = InstrumentSchema.parse((await post(admin, '/instruments', { kind: 'analyser', model: 'Later analyser', serial: 'RA-2', calibrationDueOn: '2031-04-30' }).expect(201)).body);
      const mailer = createMailer({ smtpUrl: t.capture.url, from: 'Fringewalk test <no-reply@fringewalk.invalid>' });
      const service = createInstrumentsService({ repo: createInstrumentsRepository(t.db), storage: t.storage, mailer, publicUrl: TRUSTED_ORIGIN, logger: testLogger() });
      try {
        const first = await service.sendCalibrationReminders(now);
        expect(first).toBeGreaterThanOrEqual(1);
        const mail = await t.capture.waitFor((m) => m.to.includes('admin@harrowby.example') && m.text.includes('Reminder analyser'));
        expect(mail.text).toContain('serial RA-1: calibration falls due on 2031-03-10');
        expect(mail.text).not.toContain('Later analyser');
        expect(mail.text).toContain(`${TRUSTED_ORIGIN}/instruments`);
        // Kestrel's admin hears nothing about Harrowby's instruments.
        expect((await t.capture.list()).some((m) => m.to.includes('admin@kestrel.example') && m.text.includes('Reminder analyser'))).toBe(false);

        // The same day again: nothing new for the same due date.
        const before = (await t.capture.list()).length;
        expect(await service.sendCalibrationReminders(now)).toBe(0);
        expect((await t.capture.list()).length).toBe(before);

        // Six weeks on the later one falls within 14 days; the first, now overdue, is not mailed again.
        expect(await service.sendCalibrationReminders(new Date('2031-04-20T08:00:00Z'))).toBe(1);
        const second = await t.capture.waitFor((m) => m.text.includes('Later analyser'));
        expect(second.text).not.toContain('Reminder analyser');

        // A new due date is a new reminder.
        await admin.agent.patch(`/api/orgs/${orgId}/instruments/${due.id}`).set('Origin', TRUSTED_ORIGIN).send({ calibrationDueOn: '2031-05-01' }).expect(200);
        expect(await service.sendCalibrationReminders(new Date('2031-04-25T08:00:00Z'))).toBe(1);
        expect(await countRows(t.databaseUrl, 'audit_log', `action = 'calibration_reminder' AND entity_id = '${due.id}'`)).toBe(2);
        expect(await countRows(t.databaseUrl, 'audit_log', `action = 'calibration_reminder' AND entity_id = '${later.id}'`)).toBe(1);
      } finally {
        mailer.close();
      }
    });
  });
});
