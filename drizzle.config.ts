import { defineConfig } from 'drizzle-kit';

// `npm run db:generate` writes a new migration under db/migrations after a schema change.
// The server applies them with drizzle's migrator on start (server/storage).
export default defineConfig({
  dialect: 'sqlite',
  schema: './db/schema.ts',
  out: './db/migrations',
  dbCredentials: { url: process.env.DATA_DIR ? `${process.env.DATA_DIR}/holdfast.sqlite` : './data/holdfast.sqlite' },
});
