import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import type { AuditEntry } from '../../../shared/schemas/audit';
import type { SiteSummary } from '../../../shared/schemas/home';
import type { Level, LevelCreate, LevelUpdate, SiteCreate, SiteDetail, SiteUpdate } from '../../../shared/schemas/site';
import type { AuditContext } from '../../lib/audit-context';
import type { Db, DbOrTx } from '../../db/client';
import { listAuditEntries } from '../../db/audit';
import { planView } from '../../db/plan-view';
import { auditLog, emitters, levels, plans, rooms, sites, sources, stations, surveyAssignments, surveys } from '../../db/schema';
import { createSynced, updateSynced } from '../../db/synced-write';

type LevelRow = typeof levels.$inferSelect;

export function createSitesRepository(db: Db) {
  const summary = {
    id: sites.id,
    name: sites.name,
    address: sites.address,
    // Correlated subqueries spell out their aliases: Drizzle renders a column inside sql`` without its
    // table in a single-table select, so `${levels.siteId} = ${sites.id}` would compare levels with itself.
    levelCount: sql<number>`(SELECT count(*)::int FROM ${levels} l WHERE l.site_id = ${sites}.id AND l.organisation_id = ${sites}.organisation_id AND NOT l.deleted)`,
    sourceCount: sql<number>`(SELECT count(*)::int FROM ${sources} s WHERE s.site_id = ${sites}.id AND s.organisation_id = ${sites}.organisation_id AND NOT s.deleted)`,
    archived: sites.archived,
  };

  const siteRow = async (q: DbOrTx, organisationId: string, siteId: string, lock = false) => {
    const base = q
      .select()
      .from(sites)
      .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId), eq(sites.deleted, false)))
      .limit(1);
    const [row] = lock ? await base.for('update') : await base;
    return row ?? null;
  };

  const levelRow = async (q: DbOrTx, organisationId: string, levelId: string, lock = false) => {
    const base = q
      .select()
      .from(levels)
      .where(and(eq(levels.organisationId, organisationId), eq(levels.id, levelId), eq(levels.deleted, false)))
      .limit(1);
    const [row] = lock ? await base.for('update') : await base;
    return row ?? null;
  };

  /** Levels with their current plan (the newest live upload). */
  async function levelViews(q: DbOrTx, organisationId: string, rows: LevelRow[]): Promise<Level[]> {
    if (rows.length === 0) return [];
    const planRows = await q
      .select()
      .from(plans)
      .where(and(eq(plans.organisationId, organisationId), inArray(plans.levelId, rows.map((r) => r.id)), eq(plans.deleted, false)))
      .orderBy(desc(plans.createdAt), desc(plans.id));
    return rows.map((level) => {
      const plan = planRows.find((p) => p.levelId === level.id);
      return {
        id: level.id,
        siteId: level.siteId,
        name: level.name,
        ordinal: level.ordinal,
        elevationM: level.elevationM,
        archived: level.archived,
        revision: level.revision,
        changeSeq: level.changeSeq,
        plan: plan ? planView(plan, level.siteId) : null,
      };
    });
  }

  async function listLevels(q: DbOrTx, organisationId: string, siteId: string): Promise<Level[]> {
    const rows = await q
      .select()
      .from(levels)
      .where(and(eq(levels.organisationId, organisationId), eq(levels.siteId, siteId), eq(levels.deleted, false)))
      .orderBy(asc(levels.ordinal), asc(levels.name));
    return levelViews(q, organisationId, rows);
  }

  async function detail(q: DbOrTx, organisationId: string, siteId: string): Promise<SiteDetail | null> {
    const [head] = await q
      .select({ ...summary, notes: sites.notes, revision: sites.revision, changeSeq: sites.changeSeq, updatedAt: sites.updatedAt })
      .from(sites)
      .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId), eq(sites.deleted, false)))
      .limit(1);
    if (!head) return null;
    return { ...head, updatedAt: head.updatedAt.toISOString(), levels: await listLevels(q, organisationId, siteId) };
  }

  return {
    async list(organisationId: string): Promise<SiteSummary[]> {
      return db
        .select(summary)
        .from(sites)
        .where(and(eq(sites.organisationId, organisationId), eq(sites.deleted, false)))
        .orderBy(asc(sites.archived), asc(sites.name));
    },

    /** Scoped by organisation: another organisation's site id finds nothing. */
    async find(organisationId: string, siteId: string): Promise<SiteSummary | null> {
      const [row] = await db
        .select(summary)
        .from(sites)
        .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId), eq(sites.deleted, false)))
        .limit(1);
      return row ?? null;
    },

    detail: (organisationId: string, siteId: string) => detail(db, organisationId, siteId),

    async create(organisationId: string, input: SiteCreate, ctx: AuditContext): Promise<SiteDetail> {
      return db.transaction(async (tx) => {
        const row = await createSynced(tx, sites, 'sites', organisationId, { name: input.name, address: input.address ?? null, notes: input.notes ?? null }, ctx);
        return (await detail(tx, organisationId, row.id))!;
      });
    },

    /** Null when there is no such site in this organisation. */
    async update(organisationId: string, siteId: string, patch: SiteUpdate & { archived?: boolean }, ctx: AuditContext, action?: string): Promise<SiteDetail | null> {
      return db.transaction(async (tx) => {
        const before = await siteRow(tx, organisationId, siteId, true);
        if (!before) return null;
        await updateSynced(tx, sites, 'sites', before, patch, ctx, action ? { action } : {});
        return detail(tx, organisationId, siteId);
      });
    },

    listLevels: (organisationId: string, siteId: string) => listLevels(db, organisationId, siteId),

    async findLevel(organisationId: string, levelId: string): Promise<Level | null> {
      const row = await levelRow(db, organisationId, levelId);
      return row ? ((await levelViews(db, organisationId, [row]))[0] ?? null) : null;
    },

    async createLevel(organisationId: string, siteId: string, input: LevelCreate, ctx: AuditContext): Promise<Level> {
      return db.transaction(async (tx) => {
        const row = await createSynced(tx, levels, 'levels', organisationId, { siteId, name: input.name, ordinal: input.ordinal, elevationM: input.elevationM }, ctx);
        return (await levelViews(tx, organisationId, [row]))[0]!;
      });
    },

    async updateLevel(organisationId: string, levelId: string, patch: LevelUpdate, ctx: AuditContext): Promise<Level | null> {
      return db.transaction(async (tx) => {
        const before = await levelRow(tx, organisationId, levelId, true);
        if (!before) return null;
        const row = await updateSynced(tx, levels, 'levels', before, patch, ctx);
        return (await levelViews(tx, organisationId, [row]))[0]!;
      });
    },

    /**
     * Audit rows of a site and of everything on it (levels, plans, rooms, emitters, magnets, surveys,
     * their stations and assignments). Ids are collected including tombstoned children, so
     * the history of a deleted room is still there.
     */
    async audit(organisationId: string, siteId: string, limit: number): Promise<AuditEntry[]> {
      const org = organisationId;
      const ids = sql`(
        SELECT ${siteId}::text
        UNION ALL SELECT l.id::text FROM ${levels} l WHERE l.organisation_id = ${org} AND l.site_id = ${siteId}
        UNION ALL SELECT p.id::text FROM ${plans} p JOIN ${levels} l ON l.id = p.level_id WHERE p.organisation_id = ${org} AND l.site_id = ${siteId}
        UNION ALL SELECT r.id::text FROM ${rooms} r JOIN ${levels} l ON l.id = r.level_id WHERE r.organisation_id = ${org} AND l.site_id = ${siteId}
        UNION ALL SELECT e.id::text FROM ${emitters} e JOIN ${rooms} r ON r.id = e.room_id JOIN ${levels} l ON l.id = r.level_id WHERE e.organisation_id = ${org} AND l.site_id = ${siteId}
        UNION ALL SELECT s.id::text FROM ${sources} s WHERE s.organisation_id = ${org} AND s.site_id = ${siteId}
        UNION ALL SELECT v.id::text FROM ${surveys} v WHERE v.organisation_id = ${org} AND v.site_id = ${siteId}
        UNION ALL SELECT st.id::text FROM ${stations} st JOIN ${surveys} v ON v.id = st.survey_id WHERE st.organisation_id = ${org} AND v.site_id = ${siteId}
        UNION ALL SELECT a.id::text FROM ${surveyAssignments} a JOIN ${surveys} v ON v.id = a.survey_id WHERE a.organisation_id = ${org} AND v.site_id = ${siteId}
      )`;
      return listAuditEntries(db, organisationId, limit, sql`${auditLog.entityId} IN ${ids}`);
    },
  };
}
export type SitesRepository = ReturnType<typeof createSitesRepository>;
