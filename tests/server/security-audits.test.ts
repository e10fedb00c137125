import { settledAuditRun } from '../../server/services/audit-runs.ts'
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { eq } from 'drizzle-orm'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { audits } from '../../server/db/schema-audits.ts'
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
})
afterAll(async () => {
  await t.close()
  await database.close()
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
