/**
 * Watch bands (issue 8 §1): an organisation's protected frequency ranges, kept by EMC engineers and
 * admins. Names are unique within their scope (the organisation, or one site) regardless of case, so a
 * CSV row or the starter set finds "its" band by name. Every write is synced and audited.
 */
import { parseWatchBandCsv, watchBandsToCsv } from '../../../shared/bands/csv';
import { mriReceiveWatchBand, sameBand, STARTER_WATCH_BANDS } from '../../../shared/bands/starter-set';
import type { WatchBand, WatchBandCreate, WatchBandImport, WatchBandImportResult, WatchBandUpdate } from '../../../shared/schemas/watch-band';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import { watchBandView, type WatchBandRow, type WatchBandsRepository, type WatchBandValues } from './watch-bands.repository';

function invalid(path: string, message: string): AppError {
  return new AppError('VALIDATION_FAILED', message, { issues: [{ in: 'body', path, message }] });
}

const sameName = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

export function createWatchBandsService(repo: WatchBandsRepository) {
  async function checkName(organisationId: string, siteId: string | null, name: string, exceptId?: string) {
    if (await repo.findByName(organisationId, siteId, name, exceptId)) {
      throw new AppError('CONFLICT', `There is already a band called "${name}"${siteId ? ' on this site' : ''}: give this one another name or edit that one.`, {
        issues: [{ in: 'body', path: 'name', message: 'That name is taken.' }],
      });
    }
  }

  return {
    list: (organisationId: string) => repo.list(organisationId),

    async create(organisationId: string, input: WatchBandCreate, ctx: AuditContext): Promise<WatchBand> {
      const siteId = input.siteId ?? null;
      if (siteId && !(await repo.site(organisationId, siteId))) throw invalid('siteId', 'That site does not exist in this organisation.');
      await checkName(organisationId, siteId, input.name);
      return repo.create(
        organisationId,
        {
          siteId,
          name: input.name,
          lowerHz: input.lowerHz,
          upperHz: input.upperHz,
          reason: input.reason,
          source: input.source,
          severity: input.severity,
          thresholdDbWPerM2Hz: input.thresholdDbWPerM2Hz ?? null,
          notes: input.notes ?? null,
        },
        ctx,
      );
    },

    async update(organisationId: string, watchBandId: string, patch: WatchBandUpdate, ctx: AuditContext): Promise<WatchBand> {
      const before = await repo.findRow(organisationId, watchBandId);
      if (!before) throw notFound('That watch band');
      const lowerHz = patch.lowerHz ?? before.lowerHz;
      const upperHz = patch.upperHz ?? before.upperHz;
      if (!(lowerHz < upperHz)) throw invalid('upperHz', 'The upper edge must be above the lower edge.');
      if (patch.name !== undefined && !sameName(patch.name, before.name)) await checkName(organisationId, before.siteId, patch.name, before.id);
      return repo.update(before, patch, ctx);
    },

    async remove(organisationId: string, watchBandId: string, ctx: AuditContext): Promise<void> {
      const before = await repo.findRow(organisationId, watchBandId);
      if (!before) throw notFound('That watch band');
      await repo.remove(before, ctx);
    },

    /**
     * Adds the starter bands the organisation does not watch yet (by name, or by the same edges under
     * a name of its own); idempotent.
     */
    async addStarterSet(organisationId: string, ctx: AuditContext): Promise<{ added: WatchBand[]; alreadyPresent: number }> {
      const have = await repo.organisationWide(organisationId);
      const missing = STARTER_WATCH_BANDS.filter((s) => !have.some((b) => sameBand(b, s)));
      const rows = await repo.writeMany(
        organisationId,
        missing.map((s) => ({
          siteId: null,
          name: s.name,
          lowerHz: s.lowerHz,
          upperHz: s.upperHz,
          reason: s.reason,
          source: s.source,
          severity: s.severity,
          thresholdDbWPerM2Hz: s.thresholdDbWPerM2Hz ?? null,
          starter: true,
        })),
        [],
        ctx,
      );
      return { added: rows.map((r) => watchBandView(r, null)), alreadyPresent: STARTER_WATCH_BANDS.length - missing.length };
    },

    async exportCsv(organisationId: string): Promise<string> {
      return watchBandsToCsv(await repo.organisationWide(organisationId));
    },

    /**
     * Checks a CSV of organisation-wide bands and, by mode, imports it: `check` reports only; `all`
     * imports only when every row is good (otherwise 400 with the report and nothing written);
     * `valid_rows` imports the good rows and reports the bad. A row whose name matches an existing band
     * updates that band; any other row makes a new one.
     */
    async importCsv(organisationId: string, input: WatchBandImport, ctx: AuditContext): Promise<WatchBandImportResult> {
      const parsed = parseWatchBandCsv(input.csv);
      const report = { mode: input.mode, rows: parsed.rows, valid: parsed.valid.length, errors: parsed.errors, created: 0, updated: 0 };
      if (input.mode === 'check') return report;
      if (input.mode === 'all' && parsed.errors.length > 0) {
        const bad = parsed.errors.length;
        throw new AppError('VALIDATION_FAILED', `${bad} row${bad === 1 ? ' has' : 's have'} errors, so nothing was imported. Fix ${bad === 1 ? 'it' : 'them'}, or import only the good rows.`, { report });
      }
      if (parsed.valid.length === 0) return report;
      const have = await repo.organisationWide(organisationId);
      const creates: WatchBandValues[] = [];
      const updates: { before: WatchBandRow; patch: Partial<WatchBandValues> }[] = [];
      for (const { band } of parsed.valid) {
        const values = {
          name: band.name,
          lowerHz: band.lowerHz,
          upperHz: band.upperHz,
          reason: band.reason,
          source: band.source,
          severity: band.severity,
          thresholdDbWPerM2Hz: band.thresholdDbWPerM2Hz ?? null,
          notes: band.notes ?? null,
        };
        const before = have.find((b) => sameName(b.name, band.name));
        if (before) updates.push({ before, patch: values });
        else creates.push({ siteId: null, ...values });
      }
      await repo.writeMany(organisationId, creates, updates, ctx);
      return { ...report, created: creates.length, updated: updates.length };
    },

    /**
     * Each MRI magnet's receive band for a site, and whether the site watches it already (a site band
     * of that name or with those edges).
     */
    async mriSuggestions(organisationId: string, siteId: string) {
      if (!(await repo.site(organisationId, siteId))) throw notFound('That site');
      const [magnets, siteBands] = await Promise.all([repo.mriSources(organisationId, siteId), repo.siteBands(organisationId, siteId)]);
      return magnets.map((magnet) => {
        const band = mriReceiveWatchBand(magnet);
        const existing = siteBands.find((b) => sameBand(b, band));
        return { sourceId: magnet.id, sourceName: magnet.name, nominalFieldT: magnet.nominalFieldT, band, existingId: existing?.id ?? null };
      });
    },

    async addMriBand(organisationId: string, siteId: string, sourceId: string, ctx: AuditContext): Promise<WatchBand> {
      const suggestion = (await this.mriSuggestions(organisationId, siteId)).find((s) => s.sourceId === sourceId);
      if (!suggestion) throw notFound('That MRI magnet on this site');
      if (suggestion.existingId) throw new AppError('CONFLICT', `The site already watches "${suggestion.band.name}".`, { watchBandId: suggestion.existingId });
      return repo.create(organisationId, { siteId, ...suggestion.band }, ctx);
    },
  };
}
export type WatchBandsService = ReturnType<typeof createWatchBandsService>;
