import { createDatabase } from '../db/client.ts'
import { applyMigrations } from '../db/migrate.ts'
import { EnvError, parseMigrateEnv } from '../env.ts'
import { PostgresSetupError, stopCluster } from './postgres.ts'
import { localDatabase } from './local-database.ts'

// `npm run db:migrate`: applies pending migrations under the migration lock, then fills in the
// data they added a place for. In production (compiled, build/server/cli/migrate.js) it migrates
// DATABASE_URL and nothing else; elsewhere DATABASE_URL or the project-local cluster.
try {
  // Production has DATABASE_URL (parseMigrateEnv refuses it otherwise): no cluster is touched.
  const local = await localDatabase(parseMigrateEnv().DATABASE_URL)
  const database = createDatabase(local.url)
  try {
    await applyMigrations(database.db)
  } finally {
    await database.close()
    if (local.cluster) stopCluster(local.cluster)
  }
  console.log('Migrations applied.')
} catch (err) {
  console.error(err instanceof EnvError || err instanceof PostgresSetupError ? err.message : err)
  process.exit(1)
}
