import { settledAuditRun } from '../../server/services/audit-runs.ts'
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { eq } from 'drizzle-orm'
import express from 'express'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { audits } from '../../server/db/schema.ts'
import { bounded, boundedQueue, type BoundedQueue } from '../../server/http/bounded.ts'
import { errorHandler } from '../../server/http/errors.ts'
import { pdfLimits, pdfQueueOf } from '../../server/routes/audits.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let other: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let base: string
let auditId: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'secaudit')
  other = await clubWithPeople(database.db, 'secother')
  director = await signedIn(t, fx.people.director.email)
  base = `/api/clubs/${fx.club.id}`
  for (const [givenName, familyName] of [
    ['Ada', 'Quillmere'],
    ['Bea', 'Harrowfield'],
  ] as const) {
    await createAthlete(database.db, fx.club.id, {
      givenName,
      familyName,
      birthYear: 2012,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
  }
  auditId = await runAndStore(
    database.db,
    { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' },
    { squadId: null },
  )
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const pdfOf = (agent: TestAgent, url: string) =>
  agent
    .get(url)
    .buffer(true)
    .parse((res, cb) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => cb(null, Buffer.concat(chunks)))
    })

const until = async (condition: () => boolean) => {
  while (!condition()) await new Promise((r) => setTimeout(r, 2))
}

/** A promise the test settles when it chooses: jobs awaiting it hold their place in a queue. */
function gate() {
  let open!: () => void
  const closed = new Promise<void>((resolve) => (open = resolve))
  return { closed, open }
}

describe('GET /api/clubs/:clubId/audits/:id/report.pdf under load', () => {
  let queue: BoundedQueue

  beforeAll(() => {
    queue = pdfQueueOf(t.context)!
  })

  it('serves 40 concurrent downloads, answers the health check meanwhile, and draws at most the bound at once', async () => {
    let finished = 0
    const downloads = Array.from({ length: 40 }, () =>
      pdfOf(director, `${base}/audits/${auditId}/report.pdf`).then((res) => {
        finished++
        return res
      }),
    )
    // the health check goes out while the downloads are in flight
    await until(() => queue.running + queue.waiting > 0 || finished === 40)
    expect(finished).toBeLessThan(40)
    const health = await request(t.app).get('/api/health')
    expect(health.status).toBe(200)
    expect(health.body).toEqual({ status: 'ok', database: 'up' })

    const responses = await Promise.all(downloads)
    expect(responses.map((r) => r.status)).toEqual(Array(40).fill(200))
    for (const res of responses) {
      expect(res.headers['content-type']).toBe('application/pdf')
      expect((res.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-')
    }
    expect(queue.peak).toBeGreaterThanOrEqual(1)
    expect(queue.peak).toBeLessThanOrEqual(pdfLimits.running)
    expect(queue.running + queue.waiting).toBe(0)
  })

  it('answers 503 busy with Retry-After when the waiting line is full, and serves again once it drains', async () => {
    const held = gate()
    const fillers = Array.from({ length: pdfLimits.running + pdfLimits.waiting }, () =>
      queue.run(() => held.closed),
    )
    expect(queue.full).toBe(true)

    const refused = await director.get(`${base}/audits/${auditId}/report.pdf`)
    expect(refused.status).toBe(503)
    expect(refused.headers['retry-after']).toBe(String(pdfLimits.retryAfterSeconds))
    expect(refused.body.error.code).toBe('busy')
    expect(refused.body.error.message).toEqual(expect.any(String))

    held.open()
    await Promise.all(fillers)
    const served = await pdfOf(director, `${base}/audits/${auditId}/report.pdf`)
    expect(served.status).toBe(200)
    expect((served.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-')
  })
})

describe('a bounded handler', () => {
  it('runs the given number at once, holds the given number waiting, and refuses the rest with Retry-After', async () => {
    const queue = boundedQueue({ running: 1, waiting: 2, retryAfterSeconds: 7 })
    const held = gate()
    const app = express()
    app.get(
      '/work',
      bounded(queue, async (_req: express.Request, res: express.Response) => {
        await held.closed
        res.json({ done: true })
      }),
    )
    app.use(errorHandler)

    const accepted = Array.from({ length: 3 }, () =>
      request(app)
        .get('/work')
        .then((r) => r),
    )
    await until(() => queue.running + queue.waiting === 3)
    expect(queue.running).toBe(1)
    expect(queue.waiting).toBe(2)

    for (let i = 0; i < 2; i++) {
      const refused = await request(app).get('/work')
      expect(refused.status).toBe(503)
      expect(refused.headers['retry-after']).toBe('7')
      expect(refused.body).toEqual({ error: { code: 'busy', message: expect.any(String) } })
    }

    held.open()
    expect((await Promise.all(accepted)).map((r) => r.status)).toEqual([200, 200, 200])
    expect(queue.peak).toBe(1)
    expect((await request(app).get('/work')).status).toBe(200)
  })
})

describe('POST /api/clubs/:clubId/audits', () => {
  const auditCount = async () =>
    (await database.db.select({ id: audits.id }).from(audits).where(eq(audits.clubId, fx.club.id)))
      .length

  it('refuses a squad of another club with 404 before starting a job', async () => {
    const start = vi.spyOn(t.context.jobs, 'send')
    const before = await auditCount()
    const res = await director
      .post(`${base}/audits`)
      .send({ squadId: other.squad.id, asOf: '2026-06-30' })
    expect(res.status).toBe(404)
    expect(res.body.error.code).toBe('not_found')
    expect(res.body.error.message).toMatch(/No such squad/)
    expect(start).not.toHaveBeenCalled()
    expect(await auditCount()).toBe(before)
    start.mockRestore()
  })

  it('refuses a squad id that names no squad with 404 before starting a job', async () => {
    const start = vi.spyOn(t.context.jobs, 'send')
    const before = await auditCount()
    const res = await director
      .post(`${base}/audits`)
      .send({ squadId: randomUUID(), asOf: '2026-06-30' })
    expect(res.status).toBe(404)
    expect(res.body.error.message).toMatch(/No such squad/)
    expect(start).not.toHaveBeenCalled()
    expect(await auditCount()).toBe(before)
    start.mockRestore()
  })

  it('still starts the audit of one of its own squads', async () => {
    const res = await director
      .post(`${base}/audits`)
      .send({ squadId: fx.squad.id, asOf: '2026-06-30' })
    expect(res.status).toBe(202)
    const job = await settledAuditRun(database.db, t.context.jobs, fx.club.id, res.body.id)
    expect(job.status).toBe('done')
  })

  it('keeps running audits to the director', async () => {
    const coach = await signedIn(t, fx.people.coach.email)
    const res = await coach.post(`${base}/audits`).send({ squadId: fx.squad.id })
    expect(res.status).toBe(403)
  })
})
