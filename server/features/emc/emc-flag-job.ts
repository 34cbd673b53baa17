/**
 * The flag job of a running server (issue 8 §2): every few seconds it reads each survey's data version
 * (the highest change sequence among what its flags depend on: readings, decisions, stations, rooms,
 * emitters, watch bands, instruments, the survey itself) and recomputes the surveys whose version moved
 * since it last looked — at start-up, all of them once. Recomputing is idempotent (a run that changes
 * nothing writes nothing), so two server instances running the job, or a crash part-way, do no harm;
 * the survey's row lock makes concurrent runs of one survey take turns. Reads never compute flags.
 * A run that fails is logged and retried at the next tick; the timer never keeps the process alive.
 */
import type { Db } from '../../db/client';
import type { Logger } from '../../lib/logger';
import type { Mailer } from '../../lib/mail';
import { createEmcRepository } from './emc.repository';
import { createEmcService } from './emc.service';

export const EMC_FLAG_JOB_INTERVAL_MS = 5_000;

export interface EmcFlagJob {
  /** Runs one pass now (after any pass in progress) and resolves when it is done. */
  runOnce(): Promise<void>;
  stop(): Promise<void>;
}

export function startEmcFlagJob(deps: { db: Db; mailer: Mailer; publicUrl: string; logger: Logger; intervalMs?: number }): EmcFlagJob {
  const repo = createEmcRepository(deps.db);
  const service = createEmcService({ repo, mailer: deps.mailer, publicUrl: deps.publicUrl, logger: deps.logger });
  const seen = new Map<string, number>();
  let stopped = false;
  let running: Promise<void> = Promise.resolve();

  async function pass() {
    const versions = await repo.dataVersions();
    for (const { surveyId, organisationId, version } of versions) {
      if (stopped) return;
      if (seen.get(surveyId) === version) continue;
      try {
        const changed = await service.recompute(organisationId, surveyId);
        if (changed.created + changed.updated + changed.withdrawn > 0) deps.logger.info({ surveyId, ...changed }, 'EMC flags recomputed');
        // The recomputation's own writes raise the version: remember the version after it.
        seen.set(surveyId, (await repo.dataVersions(surveyId))[0]?.version ?? version);
      } catch (error) {
        deps.logger.error({ err: error, surveyId }, 'EMC flag recomputation failed');
      }
      // Let requests in between surveys.
      await new Promise((resolve) => setImmediate(resolve));
    }
  }

  const runOnce = () => {
    running = running.then(pass).catch((error: unknown) => deps.logger.error({ err: error }, 'EMC flag job failed'));
    return running;
  };
  void runOnce();
  const timer = setInterval(() => void runOnce(), deps.intervalMs ?? EMC_FLAG_JOB_INTERVAL_MS);
  timer.unref();
  return {
    runOnce,
    async stop() {
      stopped = true;
      clearInterval(timer);
      await running;
    },
  };
}
