import pino from 'pino'
import { createApp } from '../../server/app.ts'
import type { Database } from '../../server/db/client.ts'
import { parseEnv } from '../../server/env.ts'

export const testEnv = parseEnv({ NODE_ENV: 'test', LOG_LEVEL: 'silent' })

/** The real app over a test database, without the built client. */
export function testApp(database: Database) {
  return createApp({ env: testEnv, database, logger: pino({ level: 'silent' }) })
}
