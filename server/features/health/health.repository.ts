import { sql } from 'drizzle-orm';
import type { Db } from '../../db/client';

export function createHealthRepository(db: Db) {
  return {
    async ping(): Promise<void> {
      await db.execute(sql`SELECT 1`);
    },
  };
}
export type HealthRepository = ReturnType<typeof createHealthRepository>;
