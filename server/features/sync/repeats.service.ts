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
 * When: the push transaction puts the survey in repeat_recompute_queue; after the commit this module
 * recomputes it, debounced per survey (a device pushing twenty batches in a row costs one recomputation,
 * not twenty); GET …/repeats recomputes before answering, so it is never stale; and on start every
 * survey still queued (a crash between push and recomputation) is recomputed.
 *
 * Without holding up requests: a large survey (tens of thousands of readings) takes a second or more of
 * CPU to group, so the grouping runs in slices — readings split into parts no group can span (below),
 * grouped a few parts at a time — yielding the event loop between slices (`setImmediate`), so pushes,
 * pulls and page loads are served in between. And a push never waits for a recomputation in the
 * database: the queue entry is not locked while the survey is computed, only removed at the end if no
 * push has stamped it again meanwhile (else the survey stays queued and is computed again). Recomputing
 * is idempotent, so running it again, or twice at once (one waits for the other's lock), is harmless.
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
/**
 * Quiet time after the last push before the survey is recomputed, and the longest a survey waits while
 * pushes keep coming. A long sync (hundreds of batches, seconds apart on a slow link) would otherwise
 * pay a full recomputation every few seconds — each up to a second or more of CPU for a large survey —
 * for groups nobody is looking at; whoever looks (GET …/repeats) gets them fresh.
 */
export const REPEAT_RECOMPUTE_DEBOUNCE_MS = 1_000;
export const REPEAT_RECOMPUTE_MAX_WAIT_MS = 10_000;
/** CPU time one slice of a recomputation may take before it yields the event loop. */
export const REPEAT_SLICE_MS = 8;
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

/**
 * Splits readings (x, y, z in metres) into parts that no repeat group can span: cells of twice the radius
 * on each axis, with neighbouring occupied cells (26-neighbourhood) joined. Two readings within the
 * radius lie in the same cell or in neighbouring ones (with room to spare for rounding), so every group
 * the single-linkage grouping finds lies inside one part, and grouping each part alone finds exactly the
 * groups of the whole. Parts come in the order of their first reading. `pause` is awaited now and then
 * (the caller's yield), so a survey of many cells is split without holding the event loop.
 */
export async function independentParts<T extends { xM: number; yM: number; zM?: number }>(readings: readonly T[], radiusM: number, pause: () => Promise<void> = async () => {}): Promise<T[][]> {
  const size = 2 * radiusM;
  const keyOf = (cx: number, cy: number, cz: number) => `${cx},${cy},${cz}`;
  const cellIndex = new Map<string, number>();
  const cellOf = new Int32Array(readings.length);
  const coords: [number, number, number][] = [];
  readings.forEach((r, i) => {
    const c: [number, number, number] = [Math.floor(r.xM / size), Math.floor(r.yM / size), Math.floor((r.zM ?? 0) / size)];
    const key = keyOf(...c);
    let index = cellIndex.get(key);
    if (index === undefined) {
      index = coords.length;
      cellIndex.set(key, index);
      coords.push(c);
    }
    cellOf[i] = index;
  });
  const parent = Int32Array.from({ length: coords.length }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]!]!;
      i = parent[i]!;
    }
    return i;
  };
  for (let index = 0; index < coords.length; index += 1) {
    const [cx, cy, cz] = coords[index]!;
    for (let dx = -1; dx <= 1; dx += 1)
      for (let dy = -1; dy <= 1; dy += 1)
        for (let dz = -1; dz <= 1; dz += 1) {
          const other = cellIndex.get(keyOf(cx + dx, cy + dy, cz + dz));
          if (other === undefined) continue;
          const a = find(index);
          const b = find(other);
          if (a !== b) parent[Math.max(a, b)] = Math.min(a, b);
        }
    if (index % 2_000 === 1_999) await pause();
  }
  const parts = new Map<number, T[]>();
  readings.forEach((r, i) => {
    const root = find(cellOf[i]!);
    const part = parts.get(root);
    if (part) part.push(r);
    else parts.set(root, [r]);
  });
  return [...parts.values()];
}

/** Yields the event loop: whatever is waiting (requests, I/O) runs before the work goes on. */
const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

export interface RepeatResult {
  surveyId: string;
  radiusM: number;
  coverageFactor: number;
  defaultRelativeStandardUncertainty: number;
  groups: RepeatGroupView[];
}

export interface RepeatsServiceDeps {
  repo: SyncRepository;
  logger: Logger;
  /** Awaited between slices of a recomputation (default: yield the event loop with setImmediate). */
  pause?: () => Promise<void>;
  /** CPU time per slice, ms (default REPEAT_SLICE_MS; 0 pauses after every part). */
  sliceMs?: number;
}

export function createRepeatsService(deps: RepeatsServiceDeps) {
  const { repo, logger } = deps;
  const pause = deps.pause ?? yieldToEventLoop;
  const sliceMs = deps.sliceMs ?? REPEAT_SLICE_MS;
  const timers = new Map<string, { timer: NodeJS.Timeout; firstAt: number; organisationId: string }>();
  const running = new Map<string, Promise<unknown>>();
  let closed = false;

  async function computeAndStore(tx: Tx, organisationId: string, surveyId: string, onlyIfQueued: boolean): Promise<RepeatResult | null> {
    const stamp = await repo.beginRepeatRecompute(tx, surveyId);
    // A scheduled run whose survey someone else recomputed meanwhile (GET …/repeats) has nothing to do.
    if (onlyIfQueued && stamp === null) return null;
    const done = async () => {
      if (stamp !== null) await repo.finishRepeatRecompute(tx, surveyId, stamp);
    };
    const survey = await repo.surveyForRepeats(tx, organisationId, surveyId);
    if (!survey || survey.deleted) {
      await done();
      return null;
    }
    const inputs = await repo.repeatInputs(tx, organisationId, surveyId);
    const byLevel = new Map<string, typeof inputs>();
    for (const r of inputs) {
      const list = byLevel.get(r.level_id);
      if (list) list.push(r);
      else byLevel.set(r.level_id, [r]);
    }
    const stationOf = new Map(inputs.map((r) => [r.id, r.station_id]));

    // In slices: each part of a level grouped on its own (the same groups as the whole level), the event
    // loop yielded whenever a slice has taken its share of CPU time.
    let sliceStart = performance.now();
    const maybePause = async () => {
      if (performance.now() - sliceStart < sliceMs) return;
      await pause();
      sliceStart = performance.now();
    };
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
      const found = [];
      for (const part of await independentParts(readings, survey.repeatRadiusM, maybePause)) {
        if (part.length >= 2) found.push(...groupRepeatReadings(part, { radiusM: survey.repeatRadiusM }));
        await maybePause();
      }
      for (const g of found) {
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
        await maybePause();
      }
    }
    groups.sort((a, b) => (a.fingerprint < b.fingerprint ? -1 : a.fingerprint > b.fingerprint ? 1 : 0));

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
    // A signed-off survey is a closed record: its groups are shown, its flags are not changed. Sign-off
    // hashes the report (flags included) holding the survey's row, so the state is read again under that
    // row's lock before writing: a sign-off that came in while this computed wins, and no flag changes
    // under a signed report.
    const planned = toRaise.length + toRewrite.length + toWithdraw.length;
    const state = planned > 0 && survey.state !== 'signed_off' ? await repo.lockSurveyState(tx, surveyId) : survey.state;
    const writes = state === 'signed_off' ? 0 : planned;
    if (writes === 0) {
      await done();
      return { surveyId, radiusM: survey.repeatRadiusM, coverageFactor: COVERAGE_FACTOR_K, defaultRelativeStandardUncertainty: DEFAULT_RELATIVE_STANDARD_UNCERTAINTY, groups };
    }

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
    await done();
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
