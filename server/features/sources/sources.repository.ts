import { and, asc, eq } from 'drizzle-orm';
import type { Source } from '../../../shared/schemas/source';
import type { AuditContext } from '../../lib/audit-context';
import type { Db } from '../../db/client';
import { levels, sites, sources } from '../../db/schema';
import { createSynced, tombstoneSynced, updateSynced } from '../../db/synced-write';

type SourceRow = typeof sources.$inferSelect;
export type SourceValues = Omit<typeof sources.$inferInsert, 'id' | 'organisationId' | 'changeSeq' | 'revision' | 'siteId'>;

export function sourceView(row: SourceRow): Source {
  return {
    id: row.id,
    siteId: row.siteId,
    levelId: row.levelId,
    name: row.name,
    kind: row.kind,
    state: row.state,
    shielding: row.shielding,
    nominalFieldT: row.nominalFieldT,
    xM: row.xM,
    yM: row.yM,
    zM: row.zM,
    dipoleMomentAM2: row.dipoleMomentAM2,
    axis: row.axisX !== null && row.axisY !== null && row.axisZ !== null ? { x: row.axisX, y: row.axisY, z: row.axisZ } : null,
    notes: row.notes,
    revision: row.revision,
    changeSeq: row.changeSeq,
    updatedAt: row.updatedAt.toISOString(),
  };
}

export function createSourcesRepository(db: Db) {
  const findRow = async (organisationId: string, sourceId: string) => {
    const [row] = await db
      .select()
      .from(sources)
      .where(and(eq(sources.organisationId, organisationId), eq(sources.id, sourceId), eq(sources.deleted, false)))
      .limit(1);
    return row ?? null;
  };

  return {
    findRow,
    async siteExists(organisationId: string, siteId: string): Promise<boolean> {
      const [row] = await db
        .select({ id: sites.id })
        .from(sites)
        .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId), eq(sites.deleted, false)))
        .limit(1);
      return Boolean(row);
    },
    async levelSite(organisationId: string, levelId: string): Promise<string | null> {
      const [row] = await db
        .select({ siteId: levels.siteId })
        .from(levels)
        .where(and(eq(levels.organisationId, organisationId), eq(levels.id, levelId), eq(levels.deleted, false)))
        .limit(1);
      return row?.siteId ?? null;
    },
    async list(organisationId: string, siteId: string): Promise<Source[]> {
      const rows = await db
        .select()
        .from(sources)
        .where(and(eq(sources.organisationId, organisationId), eq(sources.siteId, siteId), eq(sources.deleted, false)))
        .orderBy(asc(sources.name), asc(sources.id));
      return rows.map(sourceView);
    },
    async create(organisationId: string, siteId: string, values: SourceValues, ctx: AuditContext): Promise<Source> {
      return db.transaction(async (tx) => sourceView(await createSynced(tx, sources, 'sources', organisationId, { ...values, siteId }, ctx)));
    },
    async update(before: SourceRow, patch: Partial<SourceValues>, ctx: AuditContext): Promise<Source> {
      return db.transaction(async (tx) => sourceView(await updateSynced(tx, sources, 'sources', before, patch, ctx)));
    },
    async remove(before: SourceRow, ctx: AuditContext): Promise<void> {
      await db.transaction(async (tx) => {
        await tombstoneSynced(tx, sources, 'sources', before, ctx);
      });
    },
  };
}
export type SourcesRepository = ReturnType<typeof createSourcesRepository>;
