import { defineConfig } from 'drizzle-kit'

// `npm run db:generate` only diffs the schema against drizzle/meta, so it needs no
// running server; the URL is used by drizzle-kit's other commands.
export default defineConfig({
  dialect: 'postgresql',
  schema: './app/server/db/schema.server.ts',
  out: './drizzle',
  casing: 'snake_case',
  strict: true,
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://127.0.0.1:54329/cyclewright' },
})
