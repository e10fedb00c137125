import type { TestProject } from 'vitest/node'
import { createDatabase } from '../../server/db/client.ts'
import { applyMigrations } from '../../server/db/migrate.ts'
import {
  clusterUrl,
  ensureDatabase,
  removeCluster,
  startCluster,
  throwawayCluster,
  type Cluster,
} from '../../server/cli/postgres.ts'

export const templateDatabase = 'twofold_template'

declare module 'vitest' {
  export interface ProvidedContext {
    testCluster: Cluster
  }
}

/**
 * One throwaway cluster for the server tests, with a migrated template database; each test
 * file copies the template into a database of its own (see ./database.ts).
 */
export default async function setup(project: TestProject) {
  const cluster = await throwawayCluster()
  startCluster(cluster)
  await ensureDatabase(cluster, templateDatabase)
  const database = createDatabase(clusterUrl(cluster, templateDatabase))
  try {
    await applyMigrations(database.db)
  } finally {
    await database.close()
  }
  project.provide('testCluster', cluster)
  return () => removeCluster(cluster)
}
