import { createDatabase } from '../db/client.ts'
import { applyMigrations } from '../db/migrate.ts'
import type { Env } from '../env.ts'
import { seedDemoIfEmpty } from '../../seed/demo.ts'
import type { ClipStore } from '../storage/clip-store.ts'
import type { LocalDatabase } from './local-database.ts'

export { projectDir } from '../paths.ts'
export { localDatabase, type LocalDatabase } from './local-database.ts'

/**
 * Applies migrations (with the data they added a place for) and, unless `seed` is false, loads
 * the demo club into an empty database. Safe to run every start.
 */
export async function prepareDatabase(
  url: string,
  options: { seed?: boolean; today?: Date; clips?: ClipStore | null } = {},
) {
  const database = createDatabase(url)
  try {
    await applyMigrations(database.db)
    return options.seed === false
      ? null
      : await seedDemoIfEmpty(database.db, { today: options.today, clips: options.clips })
  } finally {
    await database.close()
  }
}

export type DemoPreparation =
  | { seeded: Awaited<ReturnType<typeof seedDemoIfEmpty>>; refused?: undefined }
  | { seeded: null; refused: string }

/**
 * The database step of `npm start` and `npm run dev`. The demo club is loaded into the
 * project-local cluster when it is empty; into a DATABASE_URL database only when the person
 * asks with TWOFOLD_DEMO_SEED=yes, since every demo account has the password printed in the
 * README and that database may be a real one.
 */
export async function prepareLocalDatabase(
  local: LocalDatabase,
  env: Pick<Env, 'TWOFOLD_DEMO_SEED'>,
  options: { today?: Date; clips?: ClipStore | null } = {},
): Promise<DemoPreparation> {
  if (local.external && !env.TWOFOLD_DEMO_SEED) {
    await prepareDatabase(local.url, { seed: false })
    return {
      seeded: null,
      refused:
        'DATABASE_URL names a database of your own, so the demo club was not loaded into it: ' +
        'its accounts share the password printed in the README. To load it into an empty ' +
        'database anyway, start with TWOFOLD_DEMO_SEED=yes.',
    }
  }
  return { seeded: await prepareDatabase(local.url, options) }
}
