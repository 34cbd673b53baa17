/**
 * The calibration-reminder job of a running server: once at start-up and then every 24 hours. A run that
 * fails is logged and retried at the next tick; the timer never keeps the process alive on its own.
 */
import type { Db } from '../../db/client';
import type { Logger } from '../../lib/logger';
import type { Mailer } from '../../lib/mail';
import type { Storage } from '../../lib/storage';
import { createInstrumentsRepository } from './instruments.repository';
import { createInstrumentsService } from './instruments.service';

export const CALIBRATION_REMINDER_INTERVAL_MS = 24 * 60 * 60 * 1000;

export function startCalibrationReminders(deps: { db: Db; storage: Storage; mailer: Mailer; publicUrl: string; logger: Logger; intervalMs?: number }): { stop(): Promise<void> } {
  const service = createInstrumentsService({ repo: createInstrumentsRepository(deps.db), storage: deps.storage, mailer: deps.mailer, publicUrl: deps.publicUrl, logger: deps.logger });
  let running: Promise<void> = Promise.resolve();
  const run = () => {
    running = running
      .then(() => service.sendCalibrationReminders(new Date()))
      .then((count) => {
        if (count > 0) deps.logger.info({ count }, 'calibration reminders sent');
      })
      .catch((error: unknown) => deps.logger.error({ err: error }, 'calibration reminders failed'));
  };
  run();
  const timer = setInterval(run, deps.intervalMs ?? CALIBRATION_REMINDER_INTERVAL_MS);
  timer.unref();
  return {
    async stop() {
      clearInterval(timer);
      await running;
    },
  };
}
