import type { Health } from '../../../shared/schemas/health';
import type { HealthRepository } from './health.repository';

/** A database that takes longer than this to answer SELECT 1 counts as down. */
export const HEALTH_TIMEOUT_MS = 2_000;

export function createHealthService(repo: HealthRepository) {
  return {
    async check(): Promise<Health> {
      let timer: NodeJS.Timeout | undefined;
      const timeout = new Promise<never>((_, reject) => {
        timer = setTimeout(() => reject(new Error('database ping timed out')), HEALTH_TIMEOUT_MS);
      });
      try {
        await Promise.race([repo.ping(), timeout]);
        return { ok: true, database: 'up' };
      } catch {
        return { ok: false, database: 'down' };
      } finally {
        clearTimeout(timer);
      }
    },
  };
}
export type HealthService = ReturnType<typeof createHealthService>;
