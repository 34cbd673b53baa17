/**
 * The readings CSV (issue 7 §6): RFC 4180 export with units in the header, an export → import round
 * trip that loses nothing (values bit for bit, stations, people, instruments, times, notes), and an
 * import with bad rows that reports each row and imports nothing unless asked to import the good rows.
 */
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { ImportReportSchema } from '../../shared/schemas/review';
import { SurveySettingsSchema } from '../../shared/schemas/survey-setup';
import { countRows, demoEmail, expectError, signIn, sql, type SignedIn } from '../setup/api-helpers';
import { readDemoIds, type DemoIds } from '../setup/sync-fixtures';
import { createTestApp, RELAXED_RATE_LIMITS, TRUSTED_ORIGIN, type InProcessApp } from '../setup/test-app';

let t: InProcessApp;
let ids: DemoIds;
const who: Record<string, SignedIn> = {};

const exportCsv = async (surveyId: string, as = who.viewer!) => {
  const res = await as.agent.get(`/api/orgs/${ids.orgId}/surveys/${surveyId}/exports/readings.csv`).buffer(true).parse((r, cb) => {
    let data = '';
    r.setEncoding('utf8');
    r.on('data', (c: string) => (data += c));
    r.on('end', () => cb(null, data));
  });
  expect(res.status, String(res.body)).toBe(200);
  return { text: res.body as string, headers: res.headers };
};
const importCsv = (surveyId: string, csv: string, mode: 'check' | 'all' | 'valid', as = who.reviewer!) =>
  as.agent.post(`/api/orgs/${ids.orgId}/surveys/${surveyId}/imports/readings`).query({ mode }).set('Origin', TRUSTED_ORIGIN).set('Content-Type', 'text/csv').send(csv);
const parse = (text: string) => Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });

async function newSurvey(name: string): Promise<string> {
  const open = SurveySettingsSchema.parse((await who.admin!.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/settings`).expect(200)).body);
  const res = await who.admin!.agent
    .post(`/api/orgs/${ids.orgId}/sites/${open.siteId}/surveys`)
    .set('Origin', TRUSTED_ORIGIN)
    .send({ name, zoneSetId: open.zoneSetId });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id as string;
}

beforeAll(async () => {
  t = await createTestApp({ seed: seedDemo, rateLimits: RELAXED_RATE_LIMITS });
  ids = await readDemoIds(t.databaseUrl);
  for (const role of ['admin', 'reviewer', 'emc', 'surveyor', 'viewer'] as const) who[role] = await signIn(t.app, demoEmail(role));
});
afterAll(async () => {
  await t?.close();
});

describe('readings CSV export', () => {
  it('is RFC 4180 text, one row per live reading, with the units in the header', async () => {
    const { text, headers } = await exportCsv(ids.openSurveyId);
    expect(headers['content-type']).toMatch(/^text\/csv/);
    expect(headers['content-disposition']).toMatch(/attachment; filename=".*-readings\.csv"/);
    // RFC 4180 §2: records end in CRLF; no bare LF outside quoted fields.
    expect(text.endsWith('\r\n')).toBe(true);
    const header = text.slice(0, text.indexOf('\r\n')).split(',');
    expect(header).toEqual(expect.arrayContaining(['field_mT', 'magnitude_mT', 'bx_mT', 'by_mT', 'bz_mT', 'background_mT', 'x_m', 'y_m', 'probe_height_m', 'measured_at', 'surveyor_email', 'instrument_serial', 'verdict']));
    const rows = parse(text);
    expect(rows.errors).toEqual([]);
    expect(rows.data).toHaveLength(await countRows(t.databaseUrl, 'field_readings', `survey_id = '${ids.openSurveyId}' AND NOT deleted`));
    // field_mT is |B| from the database's generated column, in millitesla.
    const [db] = await sql<{ id: string; field_t: number }>(t.databaseUrl, 'SELECT id, field_t FROM field_readings WHERE survey_id = $1 AND bx_t IS NOT NULL LIMIT 1', [ids.openSurveyId]);
    const row = rows.data.find((r) => r.reading_id === db!.id)!;
    expect(Number(row.field_mT) / 1000).toBeCloseTo(db!.field_t, 15);
    expect(row.magnitude_mT).toBe('');
  });

  it('is readable by every member and by no other organisation', async () => {
    for (const role of ['admin', 'reviewer', 'emc', 'surveyor', 'viewer']) await exportCsv(ids.openSurveyId, who[role]);
    const kestrel = await signIn(t.app, 'admin@kestrel.example');
    expectError(await kestrel.agent.get(`/api/orgs/${ids.orgId}/surveys/${ids.openSurveyId}/exports/readings.csv`), 404, 'NOT_FOUND');
  });
});

describe('readings CSV import', () => {
  it('an export imported into another survey and exported again loses nothing', async () => {
    const target = await newSurvey('Round trip');
    const original = await exportCsv(ids.openSurveyId);
    const report = ImportReportSchema.parse((await importCsv(target, original.text, 'all').expect(200)).body);
    const source = parse(original.text).data;
    expect(report).toMatchObject({ committed: true, badRows: 0, importedReadings: source.length, errors: [] });
    expect(report.createdStations).toBe(new Set(source.map((r) => r.station_id)).size);

    const again = parse((await exportCsv(target)).text).data;
    expect(again).toHaveLength(source.length);
    // Ids are new and decisions are the target survey's own; everything measured is the same.
    const informational = new Set(['reading_id', 'station_id', 'verdict', 'decision_note', 'reviewer', 'decided_at']);
    const strip = (r: Record<string, string>) => Object.fromEntries(Object.entries(r).filter(([k]) => !informational.has(k)));
    const key = (r: Record<string, string>) => `${r.level_id}|${r.station_label}|${r.x_m}|${r.y_m}|${r.measured_at}|${r.surveyor_email}|${r.field_mT}`;
    const byKey = new Map(again.map((r) => [key(r), strip(r)]));
    for (const r of source) expect(byKey.get(key(r)), key(r)).toEqual(strip(r));

    // In the database the values are bit-for-bit the same doubles (float8 equality, not a tolerance).
    const [diff] = await sql<{ unmatched: number }>(
      t.databaseUrl,
      `SELECT count(*)::int AS unmatched FROM field_readings a
        WHERE a.survey_id = $1 AND NOT a.deleted AND NOT EXISTS (
          SELECT 1 FROM field_readings b JOIN stations sb ON sb.id = b.station_id JOIN stations sa ON sa.id = a.station_id
           WHERE b.survey_id = $2 AND b.measured_at = a.measured_at AND b.surveyor_user_id = a.surveyor_user_id
             AND b.magnitude_t IS NOT DISTINCT FROM a.magnitude_t AND b.bx_t IS NOT DISTINCT FROM a.bx_t AND b.by_t IS NOT DISTINCT FROM a.by_t AND b.bz_t IS NOT DISTINCT FROM a.bz_t
             AND b.background_t IS NOT DISTINCT FROM a.background_t AND b.height_m = a.height_m AND b.unit = a.unit AND b.probe_orientation = a.probe_orientation
             AND b.zeroed = a.zeroed AND b.notes IS NOT DISTINCT FROM a.notes AND b.instrument_id IS NOT DISTINCT FROM a.instrument_id
             AND sb.x_m = sa.x_m AND sb.y_m = sa.y_m AND sb.height_m = sa.height_m AND sb.level_id = sa.level_id AND sb.label IS NOT DISTINCT FROM sa.label)`,
      [ids.openSurveyId, target],
    );
    expect(diff!.unmatched).toBe(0);
    // The import is audited once, and each record is in the change log for devices.
    expect(await countRows(t.databaseUrl, 'audit_log', `action = 'import_readings' AND entity_id = '${target}'`)).toBe(1);
    const [logged] = await sql<{ n: number }>(t.databaseUrl, `SELECT count(*)::int AS n FROM change_log c JOIN field_readings r ON r.id = c.entity_id WHERE c.entity = 'field_readings' AND r.survey_id = $1`, [target]);
    expect(logged!.n).toBe(source.length);

    // The same file again: every row is already there, so nothing is imported twice.
    const twice = await importCsv(target, original.text, 'all');
    expectError(twice, 400, 'VALIDATION_FAILED');
    expect(twice.body.error.details.report.badRows).toBe(source.length);
  });

  it('quotes fields with commas, quotes and line breaks (RFC 4180 §2.6–2.7) and reads them back', async () => {
    const target = await newSurvey('Quoting');
    const note = 'Meter said "over range", then settled,\r\nre-zeroed at the door';
    const csv = [
      'level_id,station_label,x_m,y_m,surveyor_email,measured_at,magnitude_G,notes',
      `${ids.levelId},"Door, west",2.5,3.25,${demoEmail('surveyor')},2026-11-20T10:00:00.000Z,5,"${note.replace(/"/g, '""')}"`,
    ].join('\r\n');
    const report = ImportReportSchema.parse((await importCsv(target, csv, 'all').expect(200)).body);
    expect(report).toMatchObject({ committed: true, importedReadings: 1 });
    const { text } = await exportCsv(target);
    expect(text).toContain(`"${note.replace(/"/g, '""')}"`);
    expect(text).toContain('"Door, west"');
    const [row] = parse(text).data;
    expect(row).toMatchObject({ notes: note, station_label: 'Door, west', magnitude_mT: '0.5', field_mT: '0.5', unit_entered: 'mT' });
    // 5 G is 0.5 mT exactly (1 G = 10⁻⁴ T, SI Brochure table 9 note).
    const [db] = await sql<{ magnitude_t: number }>(t.databaseUrl, 'SELECT magnitude_t FROM field_readings WHERE survey_id = $1', [target]);
    expect(db!.magnitude_t).toBe(0.0005);
  });

  it('writes a text a spreadsheet would run as a formula with a leading apostrophe, leaves numbers alone, and reads it back as it was', async () => {
    // OWASP, "CSV Injection": cells starting with = + - @ tab or CR run as formulas in spreadsheets.
    const target = await newSurvey('Formulas');
    const note = '=HYPERLINK("http://example.invalid","click")';
    const csv = [
      'level_id,station_label,x_m,y_m,surveyor_email,measured_at,bx_mT,by_mT,bz_mT,notes',
      `${ids.levelId},-west door,2.5,3.25,${demoEmail('surveyor')},2026-11-20T10:00:00.000Z,-0.25,0,0.125,"${note.replace(/"/g, '""')}"`,
    ].join('\r\n');
    expect(ImportReportSchema.parse((await importCsv(target, csv, 'all').expect(200)).body)).toMatchObject({ committed: true, importedReadings: 1 });
    const [stored] = await sql<{ notes: string; bx_t: number }>(t.databaseUrl, 'SELECT notes, bx_t FROM field_readings WHERE survey_id = $1', [target]);
    expect(stored).toEqual({ notes: note, bx_t: -0.00025 });
    const { text } = await exportCsv(target);
    const [row] = parse(text).data;
    expect(row).toMatchObject({ notes: `'${note}`, station_label: "'-west door", bx_mT: '-0.25', by_mT: '0', bz_mT: '0.125' });
    // Imported again, the apostrophes go: the note and the label are the surveyor's own text.
    const again = await newSurvey('Formulas again');
    expect(ImportReportSchema.parse((await importCsv(again, text, 'all').expect(200)).body)).toMatchObject({ committed: true, importedReadings: 1 });
    const [back] = await sql<{ notes: string; label: string }>(
      t.databaseUrl,
      'SELECT r.notes, s.label FROM field_readings r JOIN stations s ON s.id = r.station_id WHERE r.survey_id = $1',
      [again],
    );
    expect(back).toEqual({ notes: note, label: '-west door' });
  });

  it('a file with bad rows gets a per-row report and nothing imported, unless the good rows are asked for', async () => {
    const target = await newSurvey('Bad rows');
    const good = (i: number) => `${ids.levelId},G${i},${i},1,${demoEmail('surveyor')},2026-11-20T10:0${i}:00Z,0.${i}1,,,,`;
    const csv = [
      'level_id,station_label,x_m,y_m,surveyor_email,measured_at,magnitude_mT,bx_mT,by_mT,bz_mT,notes',
      good(1),
      `${ids.levelId},B1,1,1,nobody@nowhere.example,2026-11-20T10:00:00Z,0.5,,,,`,
      good(2),
      `${ids.levelId},B2,1,1,${demoEmail('surveyor')},2026-11-20T10:00:00Z,"0,5",,,,decimal comma`,
      `${ids.levelId},B3,1,1,${demoEmail('surveyor')},yesterday,0.5,,,,`,
      `00000000-0000-7000-8000-000000000000,B4,1,1,${demoEmail('surveyor')},2026-11-20T10:00:00Z,0.5,,,,`,
      `${ids.levelId},B5,1,1,${demoEmail('surveyor')},2026-11-20T10:00:00Z,0.5,0.1,0.2,0.3,both`,
      `${ids.levelId},B6,1,1,${demoEmail('surveyor')},2026-11-20T10:00:00Z,,0.1,,,one component`,
      good(3),
    ].join('\r\n');
    const check = ImportReportSchema.parse((await importCsv(target, csv, 'check').expect(200)).body);
    expect(check).toMatchObject({ mode: 'check', rows: 9, goodRows: 3, badRows: 6, committed: false, importedReadings: 0 });
    const byRow = new Map(check.errors.map((e) => [e.row, e]));
    expect([...byRow.keys()].sort((a, b) => a - b)).toEqual([2, 4, 5, 6, 7, 8]);
    expect(byRow.get(2)).toMatchObject({ column: 'surveyor_email' });
    expect(byRow.get(4)).toMatchObject({ column: 'magnitude_mT' });
    expect(byRow.get(5)).toMatchObject({ column: 'measured_at' });
    expect(byRow.get(6)).toMatchObject({ column: 'level_id' });
    expect(byRow.get(7)).toMatchObject({ column: 'magnitude_mT' });
    expect(byRow.get(8)).toMatchObject({ column: 'bx_mT' });
    expect(await countRows(t.databaseUrl, 'field_readings', `survey_id = '${target}'`)).toBe(0);

    const all = await importCsv(target, csv, 'all');
    expectError(all, 400, 'VALIDATION_FAILED');
    expect(ImportReportSchema.parse(all.body.error.details.report)).toMatchObject({ badRows: 6, committed: false });
    expect(await countRows(t.databaseUrl, 'field_readings', `survey_id = '${target}'`)).toBe(0);
    expect(await countRows(t.databaseUrl, 'stations', `survey_id = '${target}'`)).toBe(0);

    const valid = ImportReportSchema.parse((await importCsv(target, csv, 'valid').expect(200)).body);
    expect(valid).toMatchObject({ committed: true, importedReadings: 3, createdStations: 3, badRows: 6 });
    expect(await countRows(t.databaseUrl, 'field_readings', `survey_id = '${target}'`)).toBe(3);
  });

  it('names a missing column once for the whole file, and refuses other content types and roles', async () => {
    const target = await newSurvey('Headers');
    const report = ImportReportSchema.parse((await importCsv(target, 'x_m,y_m\r\n1,2\r\n', 'check').expect(200)).body);
    expect(report.errors.filter((e) => e.row === 0).map((e) => e.column)).toEqual(expect.arrayContaining(['level_id', 'surveyor_email', 'measured_at', 'magnitude_mT']));
    expect(report.goodRows).toBe(0);
    const json = await who.reviewer!.agent.post(`/api/orgs/${ids.orgId}/surveys/${target}/imports/readings`).set('Origin', TRUSTED_ORIGIN).send({ csv: 'x' });
    expectError(json, 415, 'UNSUPPORTED_MEDIA_TYPE');
    expectError(await importCsv(target, 'x', 'check', who.surveyor), 403, 'FORBIDDEN');
    expectError(await importCsv(target, 'x', 'check', who.emc), 403, 'FORBIDDEN');
    expectError(await importCsv(target, '  ', 'check'), 400, 'VALIDATION_FAILED');
  });
});
