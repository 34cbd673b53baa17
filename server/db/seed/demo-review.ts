/**
 * The demo's review and EMC records, made by the server's own code once the demo rows are in the
 * database, inside the seed's transaction (so a fresh demo is all there or not at all):
 *
 * - EMC flags: the EMC service's recomputation (server/features/emc/emc.service.ts), exactly as the
 *   server's flag job runs it, over the seeded readings, watch bands and emitters. Two things differ from
 *   the job, and only in how the rows are written: a flag's id is a name-based demo id of its survey and
 *   fingerprint (the job's are random v7 ids), so every run makes the same rows; and the demo's flags
 *   e-mail nobody.
 * - Working a flag: the EMC repository's audited write with the states, notes and people the
 *   acknowledge and resolve endpoints record, at invented demo times instead of "now".
 * - Sign-off: the review service's report of the survey (what the report page shows) and its SHA-256 of
 *   the RFC 8785 canonical JSON of the report data, stored by the review repository's audited survey
 *   update — the same hash and write as a reviewer's sign-off, at the invented sign-off time. The survey
 *   must pass the server's own sign-off checks (every reading decided, none waiting for re-measure).
 *
 * Repositories take a database handle; here they get the seed's transaction, whose own `transaction`
 * makes a savepoint, so their reads see the rows just written and their writes stay in the seed's
 * transaction. EVERY NOTE AND DATE HERE IS INVENTED (demo data).
 */
import { and, eq } from 'drizzle-orm';
import type { AuditContext } from '../../lib/audit-context';
import { createLogger } from '../../lib/logger';
import type { Mailer } from '../../lib/mail';
import { createEmcRepository, type EmcRepository, type FlagRow } from '../../features/emc/emc.repository';
import { createEmcService } from '../../features/emc/emc.service';
import { createReviewRepository } from '../../features/review/review.repository';
import { createReviewService } from '../../features/review/review.service';
import type { Db, Tx } from '../client';
import { flags } from '../schema';
import { createSynced } from '../synced-write';
import { demoId } from './ids';

/** The seed's transaction as the handle repositories take (their transactions become savepoints). */
const asDb = (tx: Tx): Db => tx as unknown as Db;

/** The demo sends no e-mail: nothing here calls it (the EMC team list is empty, and a report mails nobody). */
const NO_MAIL: Mailer = {
  async send() {
    throw new Error('The demo seed sends no e-mail.');
  },
  close() {},
};

const quietLogger = () => createLogger('silent');

/** The flag's demo id: the same survey and fingerprint give the same id on every run. */
export const demoFlagId = (surveyId: string, fingerprint: string) => demoId(`flag:${surveyId}:${fingerprint}`);

/**
 * Computes a survey's line-in-band flags with the EMC service (as the flag job does). `at` stands for the
 * time the job ran (created/updated timestamps of the new flags). Returns the survey's flags.
 */
export async function computeDemoFlags(tx: Tx, organisationId: string, surveyId: string, at: Date): Promise<FlagRow[]> {
  const repo = createEmcRepository(asDb(tx));
  // The service reads some things side by side; a transaction is one connection, so they take turns.
  let turn: Promise<unknown> = Promise.resolve();
  const inTurn =
    <A extends unknown[], R>(read: (...args: A) => Promise<R>) =>
    (...args: A): Promise<R> => {
      const next = turn.then(() => read(...args));
      turn = next.catch(() => undefined);
      return next;
    };
  const seeded: EmcRepository = {
    ...repo,
    rooms: inTurn(repo.rooms),
    roomFields: inTurn(repo.roomFields),
    watchBands: inTurn(repo.watchBands),
    emitters: inTurn(repo.emitters),
    emcTeam: async () => [],
    async applyFlags(orgId, id, decide, ctx) {
      const current = await tx
        .select()
        .from(flags)
        .where(and(eq(flags.organisationId, orgId), eq(flags.surveyId, id), eq(flags.kind, 'line_in_band'), eq(flags.deleted, false)));
      const plan = decide(current);
      if (plan.updates.length > 0 || plan.withdraw.length > 0) throw new Error('A fresh demo survey has no earlier flags to update or withdraw.');
      const created: FlagRow[] = [];
      for (const values of plan.creates) {
        created.push(await createSynced(tx, flags, 'flags', orgId, { ...values, id: demoFlagId(id, values.fingerprint), createdAt: at, updatedAt: at }, ctx));
      }
      return { created, updated: 0, withdrawn: 0 };
    },
  };
  const service = createEmcService({ repo: seeded, mailer: NO_MAIL, publicUrl: '', logger: quietLogger() });
  await service.recompute(organisationId, surveyId);
  return repo.flags(organisationId, surveyId, 'line_in_band');
}

/** Acknowledges an open flag as `userId` at `at`, as POST …/flags/:id/acknowledge records it. */
export async function acknowledgeDemoFlag(tx: Tx, flag: FlagRow, userId: string, note: string, at: Date): Promise<FlagRow> {
  if (flag.state !== 'open') throw new Error(`Demo flag ${flag.fingerprint} is ${flag.state}, not open.`);
  const ctx: AuditContext = { actorUserId: userId, requestId: 'demo-seed' };
  return createEmcRepository(asDb(tx)).updateFlag(flag, { state: 'acknowledged', acknowledgedAt: at, acknowledgedByUserId: userId, acknowledgementNote: note }, ctx, 'acknowledge');
}

/** Resolves an acknowledged flag as `userId` at `at`, as POST …/flags/:id/resolve records it. */
export async function resolveDemoFlag(tx: Tx, flag: FlagRow, userId: string, resolution: string, at: Date): Promise<FlagRow> {
  if (flag.state !== 'acknowledged') throw new Error(`Demo flag ${flag.fingerprint} is ${flag.state}: acknowledge it first.`);
  const ctx: AuditContext = { actorUserId: userId, requestId: 'demo-seed' };
  return createEmcRepository(asDb(tx)).updateFlag(flag, { state: 'resolved', resolvedAt: at, resolvedByUserId: userId, resolution }, ctx, 'resolve');
}

/**
 * Signs off a submitted demo survey as `reviewerUserId` at `at`: checks it as the sign-off endpoint does,
 * hashes the report data as the report page does, and records both. Returns the stored hash.
 */
export async function signOffDemoSurvey(tx: Tx, organisationId: string, surveyId: string, reviewerUserId: string, at: Date): Promise<string> {
  const repo = createReviewRepository(asDb(tx));
  const service = createReviewService({ repo, mailer: NO_MAIL, publicUrl: '', logger: quietLogger() });
  const status = await service.status(organisationId, surveyId);
  if (status.state !== 'submitted' || status.signOffBlockers.length > 0) {
    throw new Error(`Demo survey ${surveyId} cannot be signed off: ${status.state}; ${status.signOffBlockers.map((b) => b.message).join(' ')}`);
  }
  const report = await service.report(organisationId, surveyId);
  const survey = (await repo.findSurvey(organisationId, surveyId))!;
  const ctx: AuditContext = { actorUserId: reviewerUserId, requestId: 'demo-seed' };
  await repo.updateSurvey(tx, survey, { state: 'signed_off', signedOffAt: at, signedOffByUserId: reviewerUserId, reportSha256: report.dataSha256 }, ctx, 'sign_off');
  return report.dataSha256;
}
