import { defineConfig } from 'drizzle-kit'

export default defineConfig({
  dialect: 'postgresql',
  schema: [
    './server/db/schema-accounts.ts',
    './server/db/schema-catalogue.ts',
    './server/db/schema-athletes.ts',
    './server/db/schema-audits.ts',
    './server/db/schema-visits.ts',
    './server/db/schema-planner.ts',
  ],
  out: './drizzle',
  casing: 'snake_case',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://localhost/twofold' },
})
