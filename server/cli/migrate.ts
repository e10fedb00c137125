import { parseEnv } from '../env.ts'
import { localDatabase, prepareDatabase } from './bootstrap.ts'
import { stopCluster } from './postgres.ts'

// `npm run db:migrate`: applies pending migrations to DATABASE_URL or the local cluster.
const local = await localDatabase(parseEnv().DATABASE_URL)
await prepareDatabase(local.url, { seed: false })
console.log('Migrations applied.')
if (local.cluster) stopCluster(local.cluster)
