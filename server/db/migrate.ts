import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { sql } from 'drizzle-orm'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import pg from 'pg'
import { projectDir } from '../paths.ts'
import { ensureJobSchema } from '../jobs/queue.ts'
import { backfillRecordTimelines } from '../services/progress-records.ts'
import { schema, type Db } from './client.ts'

export const migrationsFolder = join(projectDir, 'drizzle')

/**
 * The key of the PostgreSQL advisory lock held while migrating ('twofold' in ASCII). Every
 * process migrating the same database takes it first, so two releases starting at once apply
 * each migration once, one after the other.
 */
export const migrationLockKey = '32782417642089572'

function poolOf(db: Db): pg.Pool {
  const { $client } = db as Db & { $client?: unknown }
  if ($client instanceof pg.Pool) return $client
  throw new TypeError('applyMigrations needs a handle made by createDatabase (on a pool).')
}

/**
 * Applies the committed SQL migrations that this database has not seen yet, then fills in the
 * data that a migration added a place for (record timelines) and installs the job queues. Both run on one connection that
 * holds the migration lock throughout; a second caller waits for the first and then finds
 * nothing left to do.
 */
export async function applyMigrations(db: Db) {
  const client = await poolOf(db).connect()
  try {
    await client.query('select pg_advisory_lock($1::bigint)', [migrationLockKey])
    const locked = drizzle({ client, schema, casing: 'snake_case' })
    await migrate(locked, { migrationsFolder })
    await backfillRecordTimelines(locked)
    await ensureJobSchema({ executeSql: (text, values) => client.query(text, values) })
    await client.query('select pg_advisory_unlock($1::bigint)', [migrationLockKey])
    client.release()
  } catch (err) {
    // Ending the connection releases the lock, and leaves nothing half done on a pooled one.
    client.release(err as Error)
    throw err
  }
}

/**
 * How many of the committed migrations this database has not applied yet (all of them on an
 * empty one), read the way the migrator reads it: those made after the last one applied.
 */
export async function pendingMigrations(db: Db): Promise<number> {
  const journal = JSON.parse(
    readFileSync(join(migrationsFolder, 'meta', '_journal.json'), 'utf8'),
  ) as { entries: { when: number }[] }
  const { rows: table } = await db.execute<{ present: boolean }>(
    sql`select to_regclass('drizzle.__drizzle_migrations') is not null as present`,
  )
  if (!table[0]?.present) return journal.entries.length
  const { rows } = await db.execute<{ last: string | null }>(
    sql`select max(created_at)::text as last from drizzle.__drizzle_migrations`,
  )
  const last = rows[0]?.last == null ? -Infinity : Number(rows[0].last)
  return journal.entries.filter((e) => e.when > last).length
}
