import { fileURLToPath } from 'node:url'
import { createDatabase } from '../db/client.ts'
import { applyMigrations } from '../db/migrate.ts'
import { ensureJobSchema } from '../jobs/queue.ts'
import { backfillRecordTimelines } from '../services/progress.ts'
import { seedDemoIfEmpty } from '../../seed/demo.ts'
import {
  clusterUrl,
  ensureDatabase,
  initCluster,
  localDataDir,
  startCluster,
  type Cluster,
} from './postgres.ts'

export const projectDir = fileURLToPath(new URL('../..', import.meta.url))

export interface LocalDatabase {
  url: string
  /** The cluster this process started, to stop on the way out; absent with DATABASE_URL or
   * when the cluster was already running (another `npm start` may be using it). */
  cluster?: Cluster
}

/**
 * The database of `npm start` and `npm run dev`: DATABASE_URL when set, else the project-local
 * cluster, created on first use and started when not running.
 */
export async function localDatabase(databaseUrl: string | undefined): Promise<LocalDatabase> {
  if (databaseUrl) return { url: databaseUrl }
  const cluster = await initCluster(localDataDir(projectDir))
  const started = startCluster(cluster)
  await ensureDatabase(cluster, 'twofold')
  return { url: clusterUrl(cluster, 'twofold'), cluster: started ? cluster : undefined }
}

/**
 * Applies migrations, fills in data that a migration added a place for, and loads the demo club
 * into an empty database. Safe to run every start.
 */
export async function prepareDatabase(url: string, options: { seed?: boolean; today?: Date } = {}) {
  const database = createDatabase(url)
  try {
    await applyMigrations(database.db)
    await ensureJobSchema(url)
    await backfillRecordTimelines(database.db)
    return options.seed === false
      ? null
      : await seedDemoIfEmpty(database.db, { today: options.today })
  } finally {
    await database.close()
  }
}
