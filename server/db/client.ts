/**
 * The one way the server reaches PostgreSQL: a pg Pool and a Drizzle instance that knows the whole
 * schema (so repositories get typed tables and relational queries). Repositories take a `Db` or, inside
 * a transaction, a `Tx`; helpers that work in either take `DbOrTx`.
 */
import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema';

export type Schema = typeof schema;
export type Db = NodePgDatabase<Schema>;
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type DbOrTx = Db | Tx;

export interface CreateDbOptions {
  /** Pool size; pg's default is 10. */
  max?: number;
  /**
   * Called when an idle pooled connection fails (the server restarted, the network dropped). Without a
   * listener, pg's Pool re-emits the error and the process would crash; the pool replaces the client.
   */
  onIdleError?: (error: Error) => void;
}

export function createDb(url: string, options: CreateDbOptions = {}): { pool: pg.Pool; db: Db } {
  const pool = new pg.Pool({ connectionString: url, max: options.max ?? 10 });
  pool.on('error', options.onIdleError ?? ((error) => console.error('PostgreSQL connection error (idle client):', error.message)));
  const db = drizzle({ client: pool, schema });
  return { pool, db };
}
