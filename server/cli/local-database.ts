import { projectDir } from '../paths.ts'
import {
  clusterUrl,
  ensureDatabase,
  initCluster,
  localDataDir,
  startCluster,
  type Cluster,
} from './postgres.ts'

export interface LocalDatabase {
  url: string
  /** True for DATABASE_URL: a database of someone's own, not the project-local cluster. */
  external: boolean
  /** The cluster this process started, to stop on the way out; absent with DATABASE_URL or
   * when the cluster was already running (another `npm start` may be using it). */
  cluster?: Cluster
}

/**
 * The database of `npm start`, `npm run dev` and (outside production) `npm run db:migrate`:
 * DATABASE_URL when set, else the project-local cluster, created on first use and started when
 * not running.
 */
export async function localDatabase(databaseUrl: string | undefined): Promise<LocalDatabase> {
  if (databaseUrl) return { url: databaseUrl, external: true }
  const cluster = await initCluster(localDataDir(projectDir))
  const started = startCluster(cluster)
  await ensureDatabase(cluster, 'twofold')
  return {
    url: clusterUrl(cluster, 'twofold'),
    external: false,
    cluster: started ? cluster : undefined,
  }
}
