import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import type { Logger } from 'pino'
import * as accounts from './schema-accounts.ts'
import * as athletes from './schema-athletes.ts'
import * as audits from './schema-audits.ts'
import * as catalogue from './schema-catalogue.ts'

/** The tables and enums the query builder is typed with. */
export const schema = { ...accounts, ...catalogue, ...athletes, ...audits }

export type Db = NodePgDatabase<typeof schema>
/** A database handle or an open transaction: services accept either. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0]
export type DbOrTx = Db | Tx

export interface Database {
  /** The connection string it was made from (job workers open their own connections). */
  url: string
  db: Db
  pool: pg.Pool
  /** True when a trivial query answers within the connection timeout. */
  ping(): Promise<boolean>
  close(): Promise<void>
}

export function createDatabase(url: string, logger?: Logger): Database {
  const pool = new pg.Pool({
    connectionString: url,
    max: 10,
    connectionTimeoutMillis: 3_000,
    idleTimeoutMillis: 30_000,
  })
  // An idle client whose server went away emits 'error' on the pool; without a listener the
  // process would crash. The pool drops that client and makes new ones once the server is back.
  pool.on('error', (err) => logger?.warn({ err: err.message }, 'database connection lost'))
  const db = drizzle({ client: pool, schema, casing: 'snake_case' })
  return {
    url,
    db,
    pool,
    async ping() {
      try {
        await pool.query('select 1')
        return true
      } catch {
        return false
      }
    },
    close: () => pool.end(),
  }
}
