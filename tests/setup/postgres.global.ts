/**
 * Vitest global setup: one throwaway PostgreSQL cluster for the whole run (shared by every project
 * that lists this file), with a migrated template database. Test files clone the template into a
 * database of their own (tests/setup/test-db.ts), so they never touch the dev data or each other.
 * The cluster and its folder are removed when the run ends.
 */
import fs from 'node:fs';
import type { TestProject } from 'vitest/node';
import { freePort, makeThrowawayDir, startLocalPostgres, type LocalPostgres } from '../../server/db/local-postgres';
import { runMigrations } from '../../server/db/migrate';

export const TEMPLATE_DB = 'fringewalk_template';

interface Shared {
  ready: Promise<LocalPostgres>;
  users: number;
}

declare global {
  var __fringewalkTestPg: Shared | undefined;
}

declare module 'vitest' {
  export interface ProvidedContext {
    pgAdminUrl: string;
    pgTemplate: string;
  }
}

async function boot(): Promise<LocalPostgres> {
  const dir = makeThrowawayDir();
  const server = await startLocalPostgres({ dataDir: dir, port: await freePort(), database: TEMPLATE_DB, throwaway: true });
  await runMigrations(server.url);
  return server;
}

export default async function setup(project: TestProject) {
  const shared = (globalThis.__fringewalkTestPg ??= { ready: boot(), users: 0 });
  shared.users += 1;
  const server = await shared.ready;
  project.provide('pgAdminUrl', server.adminUrl);
  project.provide('pgTemplate', TEMPLATE_DB);
  return async () => {
    shared.users -= 1;
    if (shared.users > 0) return;
    globalThis.__fringewalkTestPg = undefined;
    await server.stop();
    fs.rmSync(server.dataDir, { recursive: true, force: true });
  };
}

