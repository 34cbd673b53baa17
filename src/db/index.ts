export { db, DB_NAME, FringewalkDb } from './db';
export { CURRENT_SCHEMA_VERSION, SCHEMA_V1, SCHEMA_V2, SCHEMA_V3, SCHEMA_V4 } from './schema';
export * from './errors';
export * from './normalise';
export type * from './types';
