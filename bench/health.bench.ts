import request from 'supertest'
import { benchApp, report, time, withBenchDatabase } from './harness.ts'

/** The cost of the HTTP stack on the lightest route, against the one query that route makes. */
export default async function healthBench() {
  await withBenchDatabase(async (database) => {
    const { app, mailer } = await benchApp(database)
    const agent = request(app)
    const route = await time(() => agent.get('/api/health'), 200)
    const bare = await time(() => database.pool.query('select 1'), 200)
    report('GET /api/health (in-process, supertest)', route, bare, 'select 1 on the pool')
    await mailer.close()
  })
}
