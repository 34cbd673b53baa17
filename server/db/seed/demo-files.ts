/**
 * Puts the demo plans' SVG files (server/db/seed/plans/) into the object store under the keys the seed's
 * plan rows name (`demo/<file>`), so GET …/plans/:planId/image serves them, and the demo sweeps' trace
 * files under the keys their sweeps name (server/db/seed/demo-traces.ts). Idempotent: a key already in
 * the store is left alone, so it runs on every start.
 */
import fs from 'node:fs/promises';
import path from 'node:path';
import { like } from 'drizzle-orm';
import type { Storage } from '../../lib/storage';
import type { Db } from '../client';
import { plans } from '../schema';
import { DEMO_TRACE_SWEEP_IDS } from './demo';
import { seedDemoTraceFiles } from './demo-traces';
import { PLANS_DIR } from './plan-svg';

export const DEMO_OBJECT_PREFIX = 'demo/';

/** Returns the keys it uploaded (empty when everything was there already). */
export async function seedDemoFiles(db: Db, storage: Storage): Promise<string[]> {
  const rows = await db.selectDistinct({ objectKey: plans.objectKey, mime: plans.mime }).from(plans).where(like(plans.objectKey, `${DEMO_OBJECT_PREFIX}%`));
  const uploaded: string[] = [];
  for (const row of rows) {
    if (await storage.headObject(row.objectKey)) continue;
    const fileName = path.basename(row.objectKey.slice(DEMO_OBJECT_PREFIX.length));
    const bytes = await fs.readFile(path.join(PLANS_DIR, fileName));
    await storage.putObject(row.objectKey, bytes, row.mime);
    uploaded.push(row.objectKey);
  }
  uploaded.push(...(await seedDemoTraceFiles(db, storage, DEMO_TRACE_SWEEP_IDS)));
  return uploaded;
}
