import request from 'supertest'
import pino from 'pino'
import { createApp } from '../server/app.ts'
import { parseEnv } from '../server/env.ts'
import { createMailer } from '../server/mail/mailer.ts'
import { report, time, withBenchDatabase } from './harness.ts'

/** The cost of the HTTP stack on the lightest route, against the one query that route makes. */
export default async function healthBench() {
  await withBenchDatabase(async (database) => {
    const env = parseEnv({ LOG_LEVEL: 'silent' })
    const mailer = await createMailer(env)
    const app = createApp({
      mailer,
      env,
      database,
      logger: pino({ level: 'silent' }),
    })
    const agent = request(app)
    const route = await time(() => agent.get('/api/health'), 200)
    const bare = await time(() => database.pool.query('select 1'), 200)
    report('GET /api/health (in-process, supertest)', route, bare, 'select 1 on the pool')
    await mailer.close()
  })
}
