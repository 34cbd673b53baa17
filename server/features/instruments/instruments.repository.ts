import { and, asc, eq, isNotNull, lte, sql } from 'drizzle-orm';
import type { AuditContext } from '../../lib/audit-context';
import type { Db } from '../../db/client';
import { recordAudit } from '../../db/audit';
import { auditLog, instruments, memberships, organisations, users } from '../../db/schema';
import { createSynced, updateSynced } from '../../db/synced-write';

export type InstrumentRow = typeof instruments.$inferSelect;
export type InstrumentValues = Omit<typeof instruments.$inferInsert, 'id' | 'organisationId' | 'changeSeq' | 'revision'>;

/** Audit action that records a calibration reminder (one per instrument per due date). */
export const REMINDER_ACTION = 'calibration_reminder';
/** Serialises concurrent reminder runs (two instances starting at once); an arbitrary fixed key. */
const REMINDER_LOCK_KEY = 7_320_115;

export interface DueInstrument {
  organisationId: string;
  organisationName: string;
  row: InstrumentRow;
}

export function isUniqueViolation(error: unknown): boolean {
  for (let current: unknown = error, depth = 0; current && depth < 4; depth += 1) {
    if ((current as { code?: unknown }).code === '23505') return true;
    current = (current as { cause?: unknown }).cause;
  }
  return false;
}

export function createInstrumentsRepository(db: Db) {
  return {
    async list(organisationId: string): Promise<InstrumentRow[]> {
      return db
        .select()
        .from(instruments)
        .where(and(eq(instruments.organisationId, organisationId), eq(instruments.deleted, false)))
        .orderBy(asc(instruments.archived), asc(instruments.kind), asc(instruments.model), asc(instruments.serial));
    },
    async find(organisationId: string, instrumentId: string): Promise<InstrumentRow | null> {
      const [row] = await db
        .select()
        .from(instruments)
        .where(and(eq(instruments.organisationId, organisationId), eq(instruments.id, instrumentId), eq(instruments.deleted, false)))
        .limit(1);
      return row ?? null;
    },
    async create(organisationId: string, values: InstrumentValues, ctx: AuditContext): Promise<InstrumentRow> {
      return db.transaction((tx) => createSynced(tx, instruments, 'instruments', organisationId, values, ctx));
    },
    async update(before: InstrumentRow, patch: Partial<InstrumentValues>, ctx: AuditContext, action?: string): Promise<InstrumentRow> {
      return db.transaction((tx) => updateSynced(tx, instruments, 'instruments', before, patch, ctx, action ? { action } : {}));
    },

    /**
     * Runs `send` for the live instruments due on or before `lastDueOn` that have not been reminded for
     * their current due date, grouped by organisation with that organisation's admins, and records a
     * reminder per instrument when `send` succeeds — all under one advisory lock, so two processes never
     * both send.
     */
    async withDueInstruments(
      lastDueOn: string,
      send: (group: { organisationId: string; organisationName: string; admins: { email: string; name: string }[]; due: InstrumentRow[] }) => Promise<void>,
    ): Promise<number> {
      return db.transaction(async (tx) => {
        await tx.execute(sql`SELECT pg_advisory_xact_lock(${REMINDER_LOCK_KEY})`);
        const rows = await tx
          .select({ row: instruments, organisationName: organisations.name })
          .from(instruments)
          .innerJoin(organisations, eq(organisations.id, instruments.organisationId))
          .where(
            and(
              eq(instruments.deleted, false),
              eq(instruments.archived, false),
              isNotNull(instruments.calibrationDueOn),
              lte(instruments.calibrationDueOn, lastDueOn),
              sql`NOT EXISTS (SELECT 1 FROM ${auditLog} a WHERE a.action = ${REMINDER_ACTION} AND a.entity = 'instruments' AND a.entity_id = ${instruments.id}::text AND a.after->>'calibrationDueOn' = ${instruments.calibrationDueOn}::text)`,
            ),
          )
          .orderBy(asc(instruments.organisationId), asc(instruments.calibrationDueOn));
        const byOrg = new Map<string, { organisationName: string; due: InstrumentRow[] }>();
        for (const r of rows) {
          const group = byOrg.get(r.row.organisationId) ?? { organisationName: r.organisationName, due: [] };
          group.due.push(r.row);
          byOrg.set(r.row.organisationId, group);
        }
        let reminded = 0;
        for (const [organisationId, group] of byOrg) {
          const admins = await tx
            .select({ email: users.email, name: users.name })
            .from(memberships)
            .innerJoin(users, eq(users.id, memberships.userId))
            .where(and(eq(memberships.organisationId, organisationId), eq(memberships.role, 'admin')))
            .orderBy(asc(users.email));
          if (admins.length === 0) continue;
          await send({ organisationId, ...group, admins });
          for (const row of group.due) {
            await recordAudit(tx, {
              organisationId,
              actorUserId: null,
              action: REMINDER_ACTION,
              entity: 'instruments',
              entityId: row.id,
              before: null,
              after: { calibrationDueOn: row.calibrationDueOn, recipients: admins.map((a) => a.email) },
            });
            reminded += 1;
          }
        }
        return reminded;
      });
    },
  };
}
export type InstrumentsRepository = ReturnType<typeof createInstrumentsRepository>;
