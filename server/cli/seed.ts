import { parseEnv } from '../env.ts'
import { localDatabase, prepareDatabase } from './bootstrap.ts'
import { stopCluster } from './postgres.ts'

// `npm run seed`: loads the demo club when the database has no club yet.
const local = await localDatabase(parseEnv().DATABASE_URL)
const seeded = await prepareDatabase(local.url)
console.log(
  seeded
    ? `Loaded the demo club "${seeded.club.name}".`
    : 'The database already holds a club: nothing loaded.',
)
if (local.cluster) stopCluster(local.cluster)
