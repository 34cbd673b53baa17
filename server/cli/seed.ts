/**
 * `npm run db:seed`: loads the invented demo data (server/db/seed/demo.ts) into the database named by
 * DATABASE_URL, migrating it first. Safe to run again: organisations already there are left untouched.
 * Without DATABASE_URL it only says how: `npm start` seeds the project's own database when it is empty.
 */
import { createDb } from '../db/client';
import { runMigrations } from '../db/migrate';
import { DEMO_PASSWORD, seedDemo } from '../db/seed/demo';
import { HARROWBY, KESTREL } from '../db/seed/demo-data';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error(
    [
      'DATABASE_URL is not set, so there is no database to seed.',
      'Name one, for example:',
      '  DATABASE_URL=postgres://fringewalk@127.0.0.1:5433/fringewalk npm run db:seed',
      '(`npm start` and `npm run dev` seed the project-local database by themselves when it is empty.)',
    ].join('\n'),
  );
  process.exitCode = 1;
} else {
  const { pool, db } = createDb(url, { max: 2 });
  try {
    await runMigrations(url);
    const result = await seedDemo(db);
    if (result.created) {
      console.log('Demo data loaded (invented people and places, for trying Fringewalk out only).');
      console.log(`Demo accounts, all with the password "${DEMO_PASSWORD}" (demo only — never use it for real data):`);
      for (const person of [...HARROWBY.people, ...KESTREL.people]) console.log(`  ${person.role.padEnd(9)} ${person.email}`);
    } else {
      console.log('The demo organisations are already there; nothing was changed.');
    }
  } catch (error) {
    console.error(`Seeding failed: ${error instanceof Error ? error.message : String(error)}`);
    process.exitCode = 1;
  } finally {
    await pool.end();
  }
}
