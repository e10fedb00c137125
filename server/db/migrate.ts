import { fileURLToPath } from 'node:url'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import type { Db } from './client.ts'

export const migrationsFolder = fileURLToPath(new URL('../../drizzle', import.meta.url))

/** Applies the committed SQL migrations that this database has not seen yet. */
export async function applyMigrations(db: Db) {
  await migrate(db, { migrationsFolder })
}
