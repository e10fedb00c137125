import { and, eq, sql } from 'drizzle-orm'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { mailOutbox } from '../../server/db/schema-accounts.ts'
import { elementSteps } from '../../server/db/schema-catalogue.ts'
import { recommendations } from '../../server/db/schema-visits.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { remindRecommendation } from '../../server/services/recommendation-mail.ts'
import { addDaysIso } from '../../shared/domain/visits.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { squadBWithCoach } from '../support/visits.ts'
import { addDays, clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let other: Awaited<ReturnType<typeof clubWithPeople>>
let clinician: TestAgent
let coach: TestAgent
let otherCoach: TestAgent
let director: TestAgent
let athleteId: string
let athleteB: string
let backTuck: string
let stepCount: number
const base = () => `/api/clubs/${fx.club.id}`

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'recs')
  other = await clubWithPeople(database.db, 'recs-other')
  // A second coach, of Squad B only.
  const squadB = await squadBWithCoach(database.db, fx.club.id, 'coach-b@test.example')
  const athlete = (squadId: string) =>
    createAthlete(database.db, fx.club.id, {
      givenName: 'Ada',
      familyName: squadId === fx.squad.id ? 'Example' : 'Other',
      birthYear: 2013,
      squadId,
      discipline: 'artistic-women',
    })
  athleteId = (await athlete(fx.squad.id)).id
  athleteB = (await athlete(squadB.id)).id
  backTuck = (await floorTucks(database.db, fx.club.id)).backTuck
  const [{ n }] = (await database.db
    .select({ n: sql<number>`count(*)::int` })
    .from(elementSteps)
    .where(and(eq(elementSteps.clubId, fx.club.id), eq(elementSteps.elementId, backTuck)))) as [
    { n: number },
  ]
  stepCount = n
  clinician = await signedIn(t, fx.people.clinician.email)
  coach = await signedIn(t, fx.people.coach.email)
  otherCoach = await signedIn(t, 'coach-b@test.example')
  director = await signedIn(t, fx.people.director.email)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const onElement = (change: object = {}) => ({
  squadId: fx.squad.id,
  athleteId,
  elementId: backTuck,
  suggestedStepIndex: 1,
  text: 'Hold the tuck longer before opening.',
  priority: 'high',
  dueOn: addDays(14),
  ...change,
})
const mailsTo = async (to: string, subject: string) =>
  (await database.db.select().from(mailOutbox).where(eq(mailOutbox.to, to))).filter((m) =>
    m.subject.includes(subject),
  )

describe('POST /api/clubs/:clubId/recommendations', () => {
  it("records a recommendation on an athlete's element and mails the squad's coaches once", async () => {
    const res = await clinician.post(`${base()}/recommendations`).send(onElement())
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({
      squadName: 'Squad A',
      athleteName: 'Ada Example',
      elementId: backTuck,
      suggestedStepIndex: 1,
      priority: 'high',
      status: 'open',
      history: [{ status: 'open' }],
    })
    expect(res.body.suggestedStepName).toBeTypeOf('string')
    const mails = await mailsTo(fx.people.coach.email, 'a recommendation for an athlete of Squad A')
    expect(mails).toHaveLength(1)
    // The athlete is named in the text alone, which is cleared once the mail is sent: nothing
    // kept in the outbox afterwards names them (an athlete erased later stays erased).
    await expect
      .poll(() =>
        t.mailer
          .fake!.messages()
          .filter((m) => m.subject.includes('a recommendation for an athlete of Squad A'))
          .map((m) => m.text.includes('for Ada Example (Squad A)')),
      )
      .toEqual([true])
    await expect
      .poll(async () => (await mailsTo(fx.people.coach.email, 'a recommendation'))[0]!.sentAt)
      .not.toBeNull()
    const [kept] = await mailsTo(fx.people.coach.email, 'a recommendation')
    expect(JSON.stringify(kept)).not.toContain('Ada')
    // The coach of Squad B hears nothing of Squad A.
    expect(await mailsTo('coach-b@test.example', 'a recommendation')).toHaveLength(0)
    // The reminder is held back until 3 days (the default) before the due date.
    const { rows } = await database.pool.query<{
      start_after: Date
      data: { recommendationId: string }
    }>("select start_after, data from pgboss.job where name = 'recommendation-reminder'")
    const job = rows.find((r) => r.data.recommendationId === res.body.id)!
    expect(job.start_after.toISOString().slice(0, 10)).toBe(addDaysIso(addDays(14), -3))
  })

  it.each([
    [{ suggestedStepIndex: undefined }, 'suggestedStepIndex'],
    [{ athleteId: undefined }, 'athleteId'],
    [{ text: '   ' }, 'text'],
    [{ priority: 'urgent' }, 'priority'],
    [{ dueOn: '14/02/2030' }, 'dueOn'],
    [{ dueOn: addDays(-1) }, 'dueOn'],
    [{ athleteId: 'athleteB' }, 'athleteId'],
    [{ suggestedStepIndex: 'beyond' }, 'suggestedStepIndex'],
  ])('answers 400 naming the field for %j', async (change, field) => {
    const resolved = Object.fromEntries(
      Object.entries(change).map(([k, v]) => [
        k,
        v === 'athleteB' ? athleteB : v === 'beyond' ? stepCount : v,
      ]),
    )
    const res = await clinician.post(`${base()}/recommendations`).send(onElement(resolved))
    expect(res.status).toBe(400)
    expect(res.body.error.issues.map((i: { path: string }) => i.path)).toContain(field)
  })

  it("answers 404 for another club's squad or athlete", async () => {
    await clinician
      .post(`${base()}/recommendations`)
      .send(
        onElement({
          squadId: other.squad.id,
          athleteId: undefined,
          elementId: undefined,
          suggestedStepIndex: undefined,
        }),
      )
      .expect(404)
    const stranger = await createAthlete(database.db, other.club.id, {
      givenName: 'Zed',
      familyName: 'Elsewhere',
      birthYear: 2012,
      squadId: other.squad.id,
      discipline: 'artistic-women',
    })
    await clinician
      .post(`${base()}/recommendations`)
      .send(onElement({ athleteId: stranger.id }))
      .expect(404)
  })
})

describe('coaches answer recommendations', () => {
  it('accepts, then marks done with a note; history keeps who and when; everyone sees it', async () => {
    const created = await clinician.post(`${base()}/recommendations`).send(onElement())
    const id = created.body.id
    const accepted = await coach
      .post(`${base()}/recommendations/${id}/status`)
      .send({ status: 'accepted' })
    expect(accepted.status).toBe(200)
    const done = await coach
      .post(`${base()}/recommendations/${id}/status`)
      .send({ status: 'done', note: 'Three sessions of tuck holds.' })
    expect(done.body.status).toBe('done')
    expect(
      done.body.history.map((h: { status: string; byName: string }) => [h.status, h.byName]),
    ).toEqual([
      ['open', 'clinician recs'],
      ['accepted', 'coach recs'],
      ['done', 'coach recs'],
    ])
    // Final: it cannot be declined afterwards.
    await coach
      .post(`${base()}/recommendations/${id}/status`)
      .send({ status: 'declined', note: 'Changed my mind' })
      .expect(409)
    for (const agent of [director, clinician, coach]) {
      const list = await agent
        .get(`${base()}/recommendations`)
        .query({ athleteId, elementId: backTuck })
      expect(list.body.find((r: { id: string }) => r.id === id).status).toBe('done')
    }
  })

  it('needs a reason to decline and a note when done, each naming the field', async () => {
    const created = await clinician.post(`${base()}/recommendations`).send(onElement())
    for (const status of ['declined', 'done']) {
      const res = await coach
        .post(`${base()}/recommendations/${created.body.id}/status`)
        .send({ status })
      expect(res.status).toBe(400)
      expect(res.body.error.issues[0].path).toBe('note')
    }
    await coach
      .post(`${base()}/recommendations/${created.body.id}/status`)
      .send({ status: 'maybe' })
      .expect(400)
  })

  it("refuses a coach of another squad and hides the squad's recommendations from them", async () => {
    const created = await clinician.post(`${base()}/recommendations`).send(onElement())
    await otherCoach
      .post(`${base()}/recommendations/${created.body.id}/status`)
      .send({ status: 'accepted' })
      .expect(403)
    const list = await otherCoach.get(`${base()}/recommendations`).expect(200)
    expect(list.body.map((r: { id: string }) => r.id)).not.toContain(created.body.id)
  })

  it('lists only open and accepted ones with open=true', async () => {
    const created = await clinician.post(`${base()}/recommendations`).send(onElement())
    await coach
      .post(`${base()}/recommendations/${created.body.id}/status`)
      .send({ status: 'declined', note: 'Not this season.' })
    const open = await coach.get(`${base()}/recommendations`).query({ open: 'true' })
    expect(
      open.body.every((r: { status: string }) => ['open', 'accepted'].includes(r.status)),
    ).toBe(true)
    expect(open.body.map((r: { id: string }) => r.id)).not.toContain(created.body.id)
  })
})

describe('the reminder job', () => {
  const run = (id: string) =>
    remindRecommendation(database.db, t.context.jobs, {
      clubId: fx.club.id,
      recommendationId: id,
      origin: 'http://twofold.test',
    })

  it('mails the coaches once however often it runs', async () => {
    const created = await clinician
      .post(`${base()}/recommendations`)
      .send(onElement({ text: 'Reminder case: open a little later.' }))
    expect(await run(created.body.id)).toBe(true)
    expect(await run(created.body.id)).toBe(false)
    const [row] = await database.db
      .select({ remindedAt: recommendations.remindedAt })
      .from(recommendations)
      .where(eq(recommendations.id, created.body.id))
    expect(row!.remindedAt).not.toBeNull()
    const all = await database.pool.query(
      'select count(*)::int as n from mail_outbox where "to" = $1 and subject like \'%reminder%\'',
      [fx.people.coach.email],
    )
    expect(all.rows[0].n).toBe(1)
  })

  it('sends nothing for a recommendation declined before its day', async () => {
    const created = await clinician.post(`${base()}/recommendations`).send(onElement())
    await coach
      .post(`${base()}/recommendations/${created.body.id}/status`)
      .send({ status: 'declined', note: 'Squad is tapering.' })
    expect(await run(created.body.id)).toBe(false)
  })
})
