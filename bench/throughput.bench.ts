import pino from 'pino'
import request from 'supertest'
import { createApp } from '../server/app.ts'
import { clubs } from '../server/db/schema-accounts.ts'
import { parseEnv } from '../server/env.ts'
import { createMailer } from '../server/mail/mailer.ts'
import { demoPassword, demoPeople, seedDemo } from '../seed/demo.ts'
import { withBenchDatabase } from './harness.ts'
import {
  appEnvironment,
  captureStatements,
  compareRates,
  reportRates,
  startServer,
} from './load.ts'

const connections = 20

/**
 * Requests per second from 20 concurrent clients (targets: 60% of the baseline or more):
 * `/api/health` against bare Express + pg answering `select 1`, and the demo club's squads list
 * as its signed-in director against bare Express + pg running the very statements the route
 * ran (captured from one request), in the same order with the same parameters. Each server is a
 * process of its own, the app started as production starts it; the load comes from this one.
 */
export default async function throughputBench() {
  await withBenchDatabase(async (database) => {
    await seedDemo(database.db)
    const [club] = await database.db.select({ id: clubs.id }).from(clubs)
    const env = parseEnv({ LOG_LEVEL: 'silent', SMTP_URL: 'smtp://127.0.0.1:9' })
    const mailer = await createMailer(env)
    const app = createApp({ mailer, env, database, logger: pino({ level: 'silent' }) })
    const director = demoPeople.find((p) => p.role === 'director')!.email
    const signIn = await request(app)
      .post('/api/auth/sign-in')
      .send({ email: director, password: demoPassword })
      .expect(200)
    const cookie = signIn
      .get('Set-Cookie')!
      .map((c) => c.split(';')[0]!)
      .find((c) => c.startsWith('twofold_session='))!
    const path = `/api/clubs/${club!.id}/squads`
    // The first request records the session's club; the steady state is what gets replayed.
    await request(app).get(path).set('Cookie', cookie).expect(200)
    const statements = await captureStatements(database.pool, () =>
      request(app).get(path).set('Cookie', cookie).expect(200),
    )
    await mailer.close()
    console.log(
      `\nthroughput: ${connections} clients; the squads list runs ${statements.length} statements:`,
    )
    for (const s of statements) console.log(`  ${s.text.replace(/\s+/g, ' ').slice(0, 110)}`)

    const web = await startServer('app', appEnvironment(database.url))
    const bare = await startServer('bare', {
      DATABASE_URL: database.url,
      BENCH_ROUTES: JSON.stringify([{ path: '/api/clubs/:clubId/squads', statements }]),
    })
    try {
      reportRates(
        'GET /api/health',
        await compareRates(
          { url: `${web.url}/api/health` },
          { url: `${bare.url}/api/health` },
          { connections },
        ),
        'bare Express + pg, select 1',
      )
      reportRates(
        'GET /api/clubs/:clubId/squads (signed in, demo club)',
        await compareRates(
          { url: `${web.url}${path}`, headers: { cookie } },
          { url: `${bare.url}${path}` },
          { connections },
        ),
        'bare Express + pg, the same statements',
      )
    } finally {
      await Promise.all([web.stop(), bare.stop()])
    }
  })
}
