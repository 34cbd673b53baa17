/**
 * Instruments and their calibration. `calibrationOverdue` is computed when read (due date before today,
 * UTC), never stored, so it cannot go stale. Antenna-factor tables are validated (shared/instruments/
 * antenna-factors.ts) and stored in the object store as a canonical CSV; each upload gets a new key, so a
 * reading taken earlier can still be traced to the table in force then (the old key is in the audit log).
 *
 * Calibration reminders: `sendCalibrationReminders(now)` mails each organisation's admins about live
 * instruments due within CALIBRATION_REMINDER_DAYS of `now` — or already overdue and never reminded —
 * once per instrument per due date (recorded as an audit row); a new due date earns a new reminder.
 */
import { v7 as uuidv7 } from 'uuid';
import { antennaFactorCsv, parseAntennaFactorCsv } from '../../../shared/instruments/antenna-factors';
import { CALIBRATION_REMINDER_DAYS, type AntennaFactorTable, type Instrument, type InstrumentCreate, type InstrumentUpdate } from '../../../shared/schemas/instrument';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import { escapeHtml, type Mailer } from '../../lib/mail';
import { readObjectBuffer, type Storage } from '../../lib/storage';
import { isUniqueViolation, type InstrumentRow, type InstrumentsRepository } from './instruments.repository';

const DAY_MS = 86_400_000;
/** Calendar date (YYYY-MM-DD) of an instant, in UTC. */
export const utcDate = (at: Date): string => at.toISOString().slice(0, 10);
const addDays = (date: string, days: number): string => utcDate(new Date(Date.parse(`${date}T00:00:00Z`) + days * DAY_MS));

const KIND_LABEL = { gaussmeter: 'Gaussmeter', analyser: 'Spectrum analyser', antenna: 'Antenna' } as const;

export interface InstrumentsServiceDeps {
  repo: InstrumentsRepository;
  storage: Storage;
  mailer: Mailer;
  publicUrl: string;
  logger: Logger;
  /** The clock; tests pass a fixed one. */
  now?: () => Date;
}

export function createInstrumentsService(deps: InstrumentsServiceDeps) {
  const { repo, storage, mailer, publicUrl, logger } = deps;
  const now = deps.now ?? (() => new Date());
  // Keys are immutable (a new upload gets a new key), so a parsed table can be kept for good.
  const tableCache = new Map<string, AntennaFactorTable>();

  async function loadTable(row: InstrumentRow): Promise<AntennaFactorTable | null> {
    const key = row.antennaFactorObjectKey;
    if (!key) return null;
    const cached = tableCache.get(key);
    if (cached) return cached;
    const object = await storage.getObject(key);
    if (!object) {
      logger.error({ instrumentId: row.id, key }, 'antenna-factor table missing from the object store');
      return null;
    }
    const parsed = parseAntennaFactorCsv((await readObjectBuffer(object)).toString('utf8'));
    if (!parsed.ok) return null;
    const table = { points: parsed.points, uploadedAt: row.updatedAt.toISOString() };
    if (tableCache.size > 500) tableCache.clear();
    tableCache.set(key, table);
    return table;
  }

  async function view(row: InstrumentRow): Promise<Instrument> {
    const today = utcDate(now());
    const due = row.calibrationDueOn;
    const table = await loadTable(row);
    const first = table?.points[0];
    const last = table?.points[table.points.length - 1];
    return {
      id: row.id,
      kind: row.kind,
      model: row.model,
      serial: row.serial,
      probe: row.probe,
      calibratedOn: row.calibratedOn,
      calibrationDueOn: due,
      calibrationCertificate: row.calibrationCertificate,
      relativeUncertainty: row.relativeUncertainty,
      notes: row.notes,
      archived: row.archived,
      calibrationOverdue: due !== null && due < today,
      calibrationDueSoon: due !== null && due >= today && due <= addDays(today, CALIBRATION_REMINDER_DAYS),
      antennaFactors: table && first && last ? { points: table.points.length, minFrequencyMHz: first.frequencyMHz, maxFrequencyMHz: last.frequencyMHz } : null,
      revision: row.revision,
      changeSeq: row.changeSeq,
      updatedAt: row.updatedAt.toISOString(),
    };
  }

  const duplicate = () => new AppError('CONFLICT', 'An instrument of this kind, model and serial number is already listed.');

  async function findOrThrow(organisationId: string, instrumentId: string): Promise<InstrumentRow> {
    const row = await repo.find(organisationId, instrumentId);
    if (!row) throw notFound('That instrument');
    return row;
  }

  return {
    async list(organisationId: string): Promise<Instrument[]> {
      return Promise.all((await repo.list(organisationId)).map(view));
    },
    async get(organisationId: string, instrumentId: string): Promise<Instrument> {
      return view(await findOrThrow(organisationId, instrumentId));
    },
    async create(organisationId: string, input: InstrumentCreate, ctx: AuditContext): Promise<Instrument> {
      try {
        return await view(await repo.create(organisationId, { ...input, archived: false }, ctx));
      } catch (error) {
        if (isUniqueViolation(error)) throw duplicate();
        throw error;
      }
    },
    async update(organisationId: string, instrumentId: string, patch: InstrumentUpdate, ctx: AuditContext): Promise<Instrument> {
      const before = await findOrThrow(organisationId, instrumentId);
      const calibratedOn = patch.calibratedOn !== undefined ? patch.calibratedOn : before.calibratedOn;
      const dueOn = patch.calibrationDueOn !== undefined ? patch.calibrationDueOn : before.calibrationDueOn;
      if (calibratedOn && dueOn && calibratedOn > dueOn) {
        throw new AppError('VALIDATION_FAILED', 'The due date must not be before the calibration date.', { issues: [{ in: 'body', path: 'calibrationDueOn', message: 'The due date must not be before the calibration date.' }] });
      }
      const uncertainty = patch.relativeUncertainty !== undefined ? patch.relativeUncertainty : before.relativeUncertainty;
      if (before.kind === 'gaussmeter' && uncertainty === null) {
        throw new AppError('VALIDATION_FAILED', 'A gaussmeter needs its relative uncertainty.', { issues: [{ in: 'body', path: 'relativeUncertainty', message: 'A gaussmeter needs its relative uncertainty.' }] });
      }
      if (before.kind === 'antenna' && uncertainty !== null) {
        throw new AppError('VALIDATION_FAILED', 'An antenna carries an antenna-factor table instead of an uncertainty.', { issues: [{ in: 'body', path: 'relativeUncertainty', message: 'Not for antennas.' }] });
      }
      try {
        return await view(await repo.update(before, patch, ctx));
      } catch (error) {
        if (isUniqueViolation(error)) throw duplicate();
        throw error;
      }
    },

    async setAntennaFactors(organisationId: string, instrumentId: string, csv: Buffer, ctx: AuditContext): Promise<Instrument> {
      const before = await findOrThrow(organisationId, instrumentId);
      if (before.kind !== 'antenna') throw new AppError('CONFLICT', 'Only antennas have an antenna-factor table.');
      if (csv.subarray(0, 4096).includes(0)) throw new AppError('UNSUPPORTED_FILE_TYPE', 'This file is not a text (CSV) file. Upload a CSV with frequency (MHz) and antenna factor (dB/m) columns.');
      const parsed = parseAntennaFactorCsv(csv.toString('utf8'));
      if (!parsed.ok) {
        const first = parsed.errors[0]!;
        throw new AppError('ANTENNA_FACTORS_INVALID', `The antenna-factor table has ${parsed.errors.length === 1 ? 'a problem' : `${parsed.errors.length} problems`}; the first is on row ${first.row}: ${first.message}`, { rows: parsed.errors });
      }
      const key = `orgs/${organisationId}/instruments/${instrumentId}/antenna-factors/${uuidv7()}.csv`;
      await storage.putObject(key, antennaFactorCsv(parsed.points), 'text/csv; charset=utf-8');
      try {
        return await view(await repo.update(before, { antennaFactorObjectKey: key }, ctx, 'set_antenna_factors'));
      } catch (error) {
        await storage.deleteObject(key).catch(() => undefined);
        throw error;
      }
    },

    async antennaFactors(organisationId: string, instrumentId: string): Promise<AntennaFactorTable> {
      const table = await loadTable(await findOrThrow(organisationId, instrumentId));
      if (!table) throw notFound('An antenna-factor table for this instrument');
      return table;
    },

    /** See the module comment. Returns how many instruments were reminded about. */
    async sendCalibrationReminders(at: Date = now()): Promise<number> {
      const today = utcDate(at);
      const lastDueOn = addDays(today, CALIBRATION_REMINDER_DAYS);
      return repo.withDueInstruments(lastDueOn, async ({ organisationName, admins, due }) => {
        const line = (r: InstrumentRow) => {
          const when = r.calibrationDueOn! < today ? `was due on ${r.calibrationDueOn} (overdue)` : `falls due on ${r.calibrationDueOn}`;
          return `${KIND_LABEL[r.kind]} ${r.model}, serial ${r.serial}: calibration ${when}`;
        };
        const link = `${publicUrl}/instruments`;
        const subject = due.length === 1 ? `Calibration due: ${due[0]!.model} (${due[0]!.serial})` : `Calibration due for ${due.length} instruments`;
        const text = [
          `Instruments of ${organisationName} need calibrating soon:`,
          '',
          ...due.map((r) => `- ${line(r)}`),
          '',
          'Readings taken with an instrument out of calibration are marked in reports.',
          `Update the dates once calibrated: ${link}`,
        ].join('\n');
        const html = `<p>Instruments of ${escapeHtml(organisationName)} need calibrating soon:</p><ul>${due.map((r) => `<li>${escapeHtml(line(r))}</li>`).join('')}</ul><p>Readings taken with an instrument out of calibration are marked in reports.</p><p><a href="${escapeHtml(link)}">Update the dates once calibrated</a></p>`;
        for (const admin of admins) await mailer.send({ to: admin.email, subject, text, html });
      });
    },
  };
}
export type InstrumentsService = ReturnType<typeof createInstrumentsService>;
