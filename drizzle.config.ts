import { defineConfig } from 'drizzle-kit';

// `npm run db:generate` writes SQL migrations from the schema into drizzle/; they are committed and
// never edited after they land. Applying them is `npm run db:migrate` (server/db/migrate.ts), which
// also runs on every `npm start`.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema/index.ts',
  out: './drizzle',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://fringewalk@127.0.0.1:5433/fringewalk' },
  strict: true,
});
