import { defineConfig } from 'drizzle-kit'

export default defineConfig({
  dialect: 'postgresql',
  schema: [
    './server/db/schema.ts',
    './server/db/schema-visits.ts',
    './server/db/schema-planner.ts',
  ],
  out: './drizzle',
  casing: 'snake_case',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://localhost/twofold' },
})
