/**
 * `npm run db:migrate`: applies the committed migrations to DATABASE_URL, or to the project-local
 * cluster (started for the occasion and stopped afterwards) when DATABASE_URL is unset.
 */
import path from 'node:path';
import { startLocalPostgres, type LocalPostgres } from '../db/local-postgres';
import { runMigrations } from '../db/migrate';
import { ConfigError, LOCAL_DATABASE_NAME, loadConfig } from '../lib/config';

let local: LocalPostgres | null = null;
try {
  const config = loadConfig();
  let url = config.databaseUrl;
  if (!url) {
    local = await startLocalPostgres({ dataDir: path.join(config.dataDir, 'pg'), port: config.localPgPort, database: LOCAL_DATABASE_NAME, log: console.log });
    url = local.url;
  }
  await runMigrations(url);
  console.log(`Migrations applied to ${config.databaseUrl ? 'DATABASE_URL' : `the local database on 127.0.0.1:${config.localPgPort}`}.`);
  await local?.stop();
} catch (error) {
  const message = error instanceof ConfigError || (error instanceof Error && error.name === 'PostgresSetupError') ? error.message : `Migrating failed: ${error instanceof Error ? error.message : String(error)}`;
  console.error(message);
  await local?.stop();
  process.exit(1);
}
