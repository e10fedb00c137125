import { desc, eq } from 'drizzle-orm'
import { performance } from 'node:perf_hooks'
import pino from 'pino'
import request from 'supertest'
import { createApp } from '../server/app.ts'
import { audits, clubs } from '../server/db/schema.ts'
import { parseEnv } from '../server/env.ts'
import { createMailer } from '../server/mail/mailer.ts'
import { pdfQueueOf } from '../server/routes/audits.ts'
import { demoPassword, demoPeople, seedDemo } from '../seed/demo.ts'
import { report, time, withBenchDatabase, type Timing } from './harness.ts'

const downloads = 40

function timing(samples: number[]): Timing {
  samples.sort((a, b) => a - b)
  const at = (q: number) => samples[Math.min(samples.length - 1, Math.floor(q * samples.length))]!
  return { median: at(0.5), p95: at(0.95) }
}

/**
 * The health check while 40 PDF reports of the demo club are downloaded at once, against the
 * same check on an idle server; and one download against reading the report as JSON.
 */
export default async function pdfBench() {
  await withBenchDatabase(async (database) => {
    await seedDemo(database.db)
    const env = parseEnv({ LOG_LEVEL: 'silent' })
    const mailer = await createMailer(env)
    const app = createApp({ mailer, env, database, logger: pino({ level: 'silent' }) })
    const director = request.agent(app)
    const email = demoPeople.find((p) => p.role === 'director')!.email
    await director.post('/api/auth/sign-in').send({ email, password: demoPassword }).expect(200)
    const [club] = await database.db.select({ id: clubs.id }).from(clubs)
    const [audit] = await database.db
      .select({ id: audits.id })
      .from(audits)
      .where(eq(audits.clubId, club!.id))
      .orderBy(desc(audits.asOf))
    const url = `/api/clubs/${club!.id}/audits/${audit!.id}`

    const health = () => request(app).get('/api/health').expect(200)
    const idle = await time(health, 100)

    const statuses: number[] = []
    let settled = 0
    const started = performance.now()
    const inFlight = Array.from({ length: downloads }, () =>
      director.get(`${url}/report.pdf`).then((res) => {
        statuses.push(res.status)
        settled++
      }),
    )
    const busy: number[] = []
    while (settled < downloads) {
      const start = performance.now()
      const res = await request(app).get('/api/health')
      if (settled < downloads) busy.push(performance.now() - start)
      if (res.status !== 200) statuses.push(res.status)
    }
    await Promise.all(inFlight)
    const elapsed = performance.now() - started

    report(
      `GET /api/health while ${downloads} PDF reports of the demo club download`,
      timing(busy),
      idle,
      'the same on an idle server',
    )
    const failures = statuses.filter((s) => s >= 500).length
    console.log(
      `  ${busy.length} health checks during ${(elapsed / 1000).toFixed(1)} s; ${failures} answers of 5xx; ` +
        `at most ${pdfQueueOf(app.locals.context)?.peak} reports drawn at once`,
    )

    const pdf = await time(() => director.get(`${url}/report.pdf`).expect(200), 10, 2)
    const json = await time(() => director.get(url).expect(200), 10, 2)
    report('one PDF report of the demo club', pdf, json, 'the same report as JSON')
    await mailer.close()
  })
}
