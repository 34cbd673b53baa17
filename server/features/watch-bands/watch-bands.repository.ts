import { and, asc, eq, isNull, sql } from 'drizzle-orm';
import type { WatchBand } from '../../../shared/schemas/watch-band';
import type { AuditContext } from '../../lib/audit-context';
import type { Db } from '../../db/client';
import { sites, sources, watchBands } from '../../db/schema';
import { createSynced, tombstoneSynced, updateSynced } from '../../db/synced-write';

export type WatchBandRow = typeof watchBands.$inferSelect;
export type WatchBandValues = Omit<typeof watchBands.$inferInsert, 'id' | 'organisationId' | 'changeSeq' | 'revision'>;

export function watchBandView(row: WatchBandRow, siteName: string | null): WatchBand {
  return {
    id: row.id,
    siteId: row.siteId,
    siteName,
    name: row.name,
    lowerHz: row.lowerHz,
    upperHz: row.upperHz,
    reason: row.reason,
    source: row.source,
    severity: row.severity,
    thresholdDbWPerM2Hz: row.thresholdDbWPerM2Hz,
    starter: row.starter,
    notes: row.notes,
    revision: row.revision,
    updatedAt: row.updatedAt.toISOString(),
  };
}

export function createWatchBandsRepository(db: Db) {
  const live = (organisationId: string) => and(eq(watchBands.organisationId, organisationId), eq(watchBands.deleted, false));

  async function siteName(organisationId: string, siteId: string | null): Promise<string | null> {
    if (!siteId) return null;
    const [row] = await db.select({ name: sites.name }).from(sites).where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId))).limit(1);
    return row?.name ?? null;
  }

  return {
    async list(organisationId: string): Promise<WatchBand[]> {
      const rows = await db
        .select({ band: watchBands, siteName: sites.name })
        .from(watchBands)
        .leftJoin(sites, eq(sites.id, watchBands.siteId))
        .where(live(organisationId))
        .orderBy(asc(watchBands.lowerHz), asc(watchBands.name));
      return rows.map((r) => watchBandView(r.band, r.siteName));
    },

    /** The organisation-wide bands (no site), as the CSV carries them. */
    async organisationWide(organisationId: string): Promise<WatchBandRow[]> {
      return db.select().from(watchBands).where(and(live(organisationId), isNull(watchBands.siteId))).orderBy(asc(watchBands.lowerHz), asc(watchBands.name));
    },

    /** The live bands of one site. */
    async siteBands(organisationId: string, siteId: string): Promise<WatchBandRow[]> {
      return db.select().from(watchBands).where(and(live(organisationId), eq(watchBands.siteId, siteId)));
    },

    async findRow(organisationId: string, watchBandId: string): Promise<WatchBandRow | null> {
      const [row] = await db.select().from(watchBands).where(and(live(organisationId), eq(watchBands.id, watchBandId))).limit(1);
      return row ?? null;
    },

    /** A live band of the same scope (the organisation, or one site) whose name matches regardless of case. */
    async findByName(organisationId: string, siteId: string | null, name: string, exceptId?: string): Promise<WatchBandRow | null> {
      const [row] = await db
        .select()
        .from(watchBands)
        .where(
          and(
            live(organisationId),
            siteId ? eq(watchBands.siteId, siteId) : isNull(watchBands.siteId),
            sql`lower(${watchBands.name}) = lower(${name})`,
            exceptId ? sql`${watchBands.id} <> ${exceptId}` : undefined,
          ),
        )
        .limit(1);
      return row ?? null;
    },

    async site(organisationId: string, siteId: string) {
      const [row] = await db
        .select({ id: sites.id, name: sites.name })
        .from(sites)
        .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId), eq(sites.deleted, false)))
        .limit(1);
      return row ?? null;
    },

    /** The site's MRI magnets, for their receive bands. */
    async mriSources(organisationId: string, siteId: string) {
      return db
        .select({ id: sources.id, name: sources.name, nominalFieldT: sources.nominalFieldT })
        .from(sources)
        .where(and(eq(sources.organisationId, organisationId), eq(sources.siteId, siteId), eq(sources.kind, 'mri'), eq(sources.deleted, false)))
        .orderBy(asc(sources.name));
    },

    async create(organisationId: string, values: WatchBandValues, ctx: AuditContext): Promise<WatchBand> {
      const row = await db.transaction((tx) => createSynced(tx, watchBands, 'watch_bands', organisationId, values, ctx));
      return watchBandView(row, await siteName(organisationId, row.siteId));
    },

    async update(before: WatchBandRow, patch: Partial<WatchBandValues>, ctx: AuditContext): Promise<WatchBand> {
      const row = await db.transaction((tx) => updateSynced(tx, watchBands, 'watch_bands', before, patch, ctx));
      return watchBandView(row, await siteName(before.organisationId, row.siteId));
    },

    async remove(before: WatchBandRow, ctx: AuditContext): Promise<void> {
      await db.transaction(async (tx) => {
        await tombstoneSynced(tx, watchBands, 'watch_bands', before, ctx);
      });
    },

    /**
     * Creates and updates many bands in one transaction: all of them land, or none (a failure part-way
     * leaves the organisation's list as it was).
     */
    async writeMany(
      organisationId: string,
      creates: WatchBandValues[],
      updates: { before: WatchBandRow; patch: Partial<WatchBandValues> }[],
      ctx: AuditContext,
    ): Promise<WatchBandRow[]> {
      return db.transaction(async (tx) => {
        const out: WatchBandRow[] = [];
        for (const values of creates) out.push(await createSynced(tx, watchBands, 'watch_bands', organisationId, values, ctx));
        for (const { before, patch } of updates) out.push(await updateSynced(tx, watchBands, 'watch_bands', before, patch, ctx));
        return out;
      });
    },
  };
}
export type WatchBandsRepository = ReturnType<typeof createWatchBandsRepository>;
