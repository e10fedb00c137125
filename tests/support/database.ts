import { randomBytes } from 'node:crypto'
import { inject } from 'vitest'
import { createDatabase, type Database } from '../../server/db/client.ts'
import { clusterUrl, ensureDatabase } from '../../server/cli/postgres.ts'

/** A fresh, migrated database of this test file's own, copied from the template. */
export async function freshDatabase(): Promise<Database & { url: string }> {
  const cluster = inject('testCluster')
  const name = `t_${randomBytes(6).toString('hex')}`
  await ensureDatabase(cluster, name, 'twofold_template')
  const url = clusterUrl(cluster, name)
  return { ...createDatabase(url), url }
}

/** A new database with nothing in it, not even the migrations. */
export async function emptyDatabase(): Promise<Database & { url: string }> {
  const cluster = inject('testCluster')
  const name = `empty_${randomBytes(6).toString('hex')}`
  await ensureDatabase(cluster, name)
  const url = clusterUrl(cluster, name)
  return { ...createDatabase(url), url }
}
