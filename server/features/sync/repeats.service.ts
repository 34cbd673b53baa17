/**
 * Merging walks (issue 5 §4): readings of one survey taken at stations within the survey's repeat radius
 * (default 0.3 m) of one another, on the same level, are repeat readings. They are grouped with
 * shared/physics/repeats.ts (single linkage; points are the station's x, y and the reading's probe
 * height, so a reading at 1 m and one at 1.5 m above the same spot are not repeats), summarised (mean,
 * sample spread, range) and compared pairwise by Eₙ = |Bᵢ − Bⱼ| / √(Uᵢ² + Uⱼ²) (ISO 13528; recalled).
 *
 * Uncertainty: instruments store a relative STANDARD uncertainty (server/db/schema/instruments.ts); it is
 * expanded with the coverage factor k = 2 (JCGM 100:2008, the GUM, §6.2–6.3: k = 2 gives about 95 %
 * coverage for a normal distribution; recalled), the form Eₙ expects. A reading whose instrument is
 * unknown or gives no uncertainty is taken at 2 % relative standard uncertainty — common practice for a
 * handheld Hall or fluxgate gaussmeter's stated accuracy of 1–2 % of reading (recalled; not a sourced
 * figure), so 4 % expanded.
 *
 * Taking part: live readings at live stations, not rejected by the latest decision on them.
 *
 * Flags, recomputed idempotently: a group that disagrees (some pair with Eₙ > 1) has one
 * `repeat_disagreement` flag whose fingerprint is "repeat:" + sha256 of its sorted reading ids. Finding
 * the same group again finds the same flag (rewritten only when its numbers changed, so a recomputation
 * that changes nothing writes nothing). When a group no longer disagrees, or its membership changed (a
 * new repeat, a rejected reading), a flag still `open` is withdrawn (tombstoned; a changed group raises
 * its own new flag); a flag a person has acknowledged or resolved is left as they left it — it is their
 * record of what they did.
 *
 * When: the push transaction puts the survey in repeat_recompute_queue; right after the commit this
 * module recomputes it, debounced per survey (a device pushing twenty batches in a row costs one
 * recomputation, not twenty); GET …/repeats recomputes before answering, so it is never stale; and on
 * start every survey still queued (a crash between push and recomputation) is recomputed.
 */
import { v7 as uuidv7 } from 'uuid';
import { groupRepeatReadings, type RepeatReading } from '../../../shared/physics/repeats';
import type { RepeatGroupView } from '../../../shared/schemas/sync';
import type { Tx } from '../../db/client';
import { notFound } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import { sha256Hex } from './sync.service';
import type { SyncRepository } from './sync.repository';

/** GUM coverage factor for expanded uncertainty (JCGM 100:2008 §6.3; recalled). */
export const COVERAGE_FACTOR_K = 2;
/** Relative standard uncertainty assumed for a gaussmeter that states none (common practice; recalled). */
export const DEFAULT_RELATIVE_STANDARD_UNCERTAINTY = 0.02;
/** Quiet time after the last push before the survey is recomputed, and the longest a survey waits. */
export const REPEAT_RECOMPUTE_DEBOUNCE_MS = 250;
export const REPEAT_RECOMPUTE_MAX_WAIT_MS = 3_000;
/** Delay before surveys left queued by an earlier process are picked up. */
const RESUME_DELAY_MS = 1_000;

/** JSON with object keys sorted at every depth (jsonb does not keep key order). */
function stableJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(stableJson).join(',')}]`;
  if (value && typeof value === 'object') {
    return `{${Object.keys(value as object)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${stableJson((value as Record<string, unknown>)[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(value ?? null);
}

export interface RepeatResult {
  surveyId: string;
  radiusM: number;
  coverageFactor: number;
  defaultRelativeStandardUncertainty: number;
  groups: RepeatGroupView[];
}

export function createRepeatsService(deps: { repo: SyncRepository; logger: Logger }) {
  const { repo, logger } = deps;
  const timers = new Map<string, { timer: NodeJS.Timeout; firstAt: number; organisationId: string }>();
  const running = new Map<string, Promise<unknown>>();
  let closed = false;

  async function computeAndStore(tx: Tx, organisationId: string, surveyId: string, onlyIfQueued: boolean): Promise<RepeatResult | null> {
    const queued = await repo.beginRepeatRecompute(tx, surveyId);
    // A scheduled run whose survey someone else recomputed meanwhile (GET …/repeats) has nothing to do.
    if (onlyIfQueued && !queued) return null;
    const survey = await repo.surveyForRepeats(tx, organisationId, surveyId);
    if (!survey || survey.deleted) return null;
    const inputs = await repo.repeatInputs(tx, organisationId, surveyId);
    const byLevel = new Map<string, typeof inputs>();
    for (const r of inputs) {
      const list = byLevel.get(r.level_id);
      if (list) list.push(r);
      else byLevel.set(r.level_id, [r]);
    }
    const stationOf = new Map(inputs.map((r) => [r.id, r.station_id]));

    const groups: RepeatGroupView[] = [];
    for (const [levelId, rows] of byLevel) {
      const readings: RepeatReading[] = rows.map((r) => ({
        id: r.id,
        xM: r.x_m,
        yM: r.y_m,
        zM: r.height_m,
        fieldTesla: r.field_t,
        relativeExpandedUncertainty: COVERAGE_FACTOR_K * (r.relative_uncertainty ?? DEFAULT_RELATIVE_STANDARD_UNCERTAINTY),
      }));
      for (const g of groupRepeatReadings(readings, { radiusM: survey.repeatRadiusM })) {
        const readingIds = [...g.readingIds].sort();
        groups.push({
          fingerprint: `repeat:${sha256Hex(readingIds.join(','))}`,
          levelId,
          readingIds,
          stationIds: [...new Set(readingIds.map((id) => stationOf.get(id)!))].sort(),
          count: g.count,
          meanT: g.meanTesla,
          spreadT: g.spreadTesla,
          minT: g.minTesla,
          maxT: g.maxTesla,
          maxEn: Number.isFinite(g.maxEn) ? g.maxEn : null,
          worstPair: g.worstPair ? [g.worstPair[0], g.worstPair[1]] : null,
          disagree: g.disagree,
          flagId: null,
        });
      }
    }
    groups.sort((a, b) => a.fingerprint.localeCompare(b.fingerprint));

    // Flags: one per disagreeing group, found again by fingerprint.
    const existing = new Map((await repo.repeatFlags(tx, organisationId, surveyId)).map((f) => [f.fingerprint, f]));
    const details = (g: RepeatGroupView) => ({
      readingIds: g.readingIds,
      stationIds: g.stationIds,
      levelId: g.levelId,
      count: g.count,
      meanT: g.meanT,
      spreadT: g.spreadT,
      minT: g.minT,
      maxT: g.maxT,
      maxEn: g.maxEn,
      worstPair: g.worstPair,
      radiusM: survey.repeatRadiusM,
      coverageFactor: COVERAGE_FACTOR_K,
    });
    const toRaise: RepeatGroupView[] = [];
    const toRewrite: { group: RepeatGroupView; flag: NonNullable<ReturnType<typeof existing.get>> }[] = [];
    const wanted = new Set<string>();
    for (const g of groups.filter((x) => x.disagree)) {
      wanted.add(g.fingerprint);
      const flag = existing.get(g.fingerprint);
      if (!flag) toRaise.push(g);
      else {
        g.flagId = flag.id;
        if (stableJson(flag.details) !== stableJson(details(g))) toRewrite.push({ group: g, flag });
      }
    }
    const toWithdraw = [...existing.values()].filter((f) => !wanted.has(f.fingerprint) && f.state === 'open');
    // A signed-off survey is a closed record: its groups are shown, its flags are not changed.
    const writes = survey.state === 'signed_off' ? 0 : toRaise.length + toRewrite.length + toWithdraw.length;
    if (writes === 0) return { surveyId, radiusM: survey.repeatRadiusM, coverageFactor: COVERAGE_FACTOR_K, defaultRelativeStandardUncertainty: DEFAULT_RELATIVE_STANDARD_UNCERTAINTY, groups };

    // Sequences last, then a few multi-row statements: the organisation's counter lock is held briefly.
    const seqs = await repo.reserveChangeSeqs(tx, organisationId, writes);
    let next = 0;
    const raised = await repo.insertFlags(
      tx,
      toRaise.map((g) => ({
        organisationId,
        surveyId,
        kind: 'repeat_disagreement' as const,
        severity: 'medium' as const,
        fingerprint: g.fingerprint,
        stationId: g.worstPair ? (stationOf.get(g.worstPair[0]) ?? null) : null,
        details: details(g),
        changeSeq: seqs[next++]!,
        revision: 1,
        id: uuidv7(),
      })),
    );
    raised.forEach((f, i) => (toRaise[i]!.flagId = f.id));
    const changes = [
      ...toRewrite.map(({ group, flag }) => ({ flag, details: details(group) as Record<string, unknown>, deleted: false, seq: seqs[next++]! })),
      ...toWithdraw.map((flag) => ({ flag, details: flag.details, deleted: true, seq: seqs[next++]! })),
    ];
    await repo.updateFlags(tx, changes.map((c) => ({ id: c.flag.id, details: c.details, deleted: c.deleted, revision: c.flag.revision + 1, changeSeq: c.seq })));
    await repo.insertChangeLog(tx, organisationId, [
      ...raised.map((f) => ({ seq: f.changeSeq, entity: 'flags' as const, entityId: f.id, revision: 1, deleted: false })),
      ...changes.map((c) => ({ seq: c.seq, entity: 'flags' as const, entityId: c.flag.id, revision: c.flag.revision + 1, deleted: c.deleted })),
    ]);
    await repo.insertAuditRows(tx, organisationId, null, null, [
      ...raised.map((f) => ({ action: 'raise_flag', entity: 'flags', entityId: f.id, before: null, after: f })),
      ...changes.map((c) => ({
        action: c.deleted ? 'withdraw_flag' : 'update_flag',
        entity: 'flags',
        entityId: c.flag.id,
        before: c.flag,
        after: { ...c.flag, details: c.details, deleted: c.deleted, revision: c.flag.revision + 1, changeSeq: c.seq },
      })),
    ]);
    return { surveyId, radiusM: survey.repeatRadiusM, coverageFactor: COVERAGE_FACTOR_K, defaultRelativeStandardUncertainty: DEFAULT_RELATIVE_STANDARD_UNCERTAINTY, groups };
  }

  /** Recomputes now (serialised per survey by an advisory lock) and returns the groups. */
  async function recompute(organisationId: string, surveyId: string, onlyIfQueued = false): Promise<RepeatResult | null> {
    const job = repo.transaction((tx) => computeAndStore(tx, organisationId, surveyId, onlyIfQueued));
    running.set(surveyId, job);
    try {
      return await job;
    } finally {
      if (running.get(surveyId) === job) running.delete(surveyId);
    }
  }

  function schedule(organisationId: string, surveyIds: string[]): void {
    if (closed) return;
    const now = Date.now();
    for (const surveyId of surveyIds) {
      const pending = timers.get(surveyId);
      if (pending) clearTimeout(pending.timer);
      const firstAt = pending?.firstAt ?? now;
      const delay = Math.max(0, Math.min(REPEAT_RECOMPUTE_DEBOUNCE_MS, firstAt + REPEAT_RECOMPUTE_MAX_WAIT_MS - now));
      const timer = setTimeout(() => {
        timers.delete(surveyId);
        recompute(organisationId, surveyId, true).catch((error) => logger.error({ err: error, surveyId }, 'repeat recomputation failed; the survey stays queued'));
      }, delay);
      timer.unref();
      timers.set(surveyId, { timer, firstAt, organisationId });
    }
  }

  const resumeTimer = setTimeout(() => {
    repo
      .dirtySurveys()
      .then((rows) => {
        for (const r of rows) schedule(r.organisationId, [r.surveyId]);
      })
      .catch((error) => logger.warn({ err: error }, 'could not read the repeat recomputation queue'));
  }, RESUME_DELAY_MS);
  resumeTimer.unref();

  return {
    schedule,
    /** GET …/repeats: fresh groups (recomputed, flags brought up to date). */
    async list(organisationId: string, surveyId: string): Promise<RepeatResult> {
      const pending = timers.get(surveyId);
      if (pending) {
        clearTimeout(pending.timer);
        timers.delete(surveyId);
      }
      const result = await recompute(organisationId, surveyId);
      if (!result) throw notFound('That survey');
      return result;
    },
    /** Stops the timers and waits for a recomputation in progress. */
    async close(): Promise<void> {
      closed = true;
      clearTimeout(resumeTimer);
      for (const { timer } of timers.values()) clearTimeout(timer);
      timers.clear();
      await Promise.allSettled([...running.values()]);
    },
  };
}
export type RepeatsService = ReturnType<typeof createRepeatsService>;
