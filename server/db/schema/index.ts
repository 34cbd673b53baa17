// Every table group, re-exported for drizzle-kit and for the repositories.
export * from './organisations';
export * from './auth';
export * from './sites';
export * from './instruments';
export * from './bands';
export * from './surveys';
export * from './flags';
export * from './log';
export * from './sync';
export * from './synced-tables';
export * from './maps';
