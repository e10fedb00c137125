import { parseEnv } from '../env.ts'
import { localDatabase, prepareDatabase } from './bootstrap.ts'
import { stopCluster } from './postgres.ts'

// `npm run seed`: loads the demo club when the database has no club yet. Its accounts share the
// password printed in the README, so never into a production database.
if (process.env.NODE_ENV === 'production') {
  console.error(
    'NODE_ENV=production: the demo club is never loaded in production (its accounts share ' +
      'the password printed in the README).',
  )
  process.exit(1)
}
const local = await localDatabase(parseEnv().DATABASE_URL)
const seeded = await prepareDatabase(local.url)
console.log(
  seeded
    ? `Loaded the demo club "${seeded.club.name}".`
    : 'The database already holds a club: nothing loaded.',
)
if (local.cluster) stopCluster(local.cluster)
