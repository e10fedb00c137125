import { and, eq, or } from 'drizzle-orm'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { mailOutbox } from '../../server/db/schema-accounts.ts'
import { athletes, progressEvents, progressRecords } from '../../server/db/schema-athletes.ts'
import { audits, clubArchiveFiles, clubArchives } from '../../server/db/schema-audits.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { appendHistory } from '../../server/services/progress-history.ts'
import { reportPdfInput } from '../../server/services/report-pdf.ts'
import { readPdf } from '../e2e/support-files.ts'
import { drawnPdf } from '../support/report-pdf.ts'
import { erasedAthleteLabel } from '../../shared/domain/erasure.ts'
import type { AuditReport } from '../../shared/schemas/audits.ts'
import type { RecordDetail } from '../../shared/schemas/progress.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'

// Ada is erased; Bea stays. Ada trails on the front tuck and changes category within the year
// (born 2011: senior in women's artistic from the year she turns 16), so the stored audit lists
// her in its athletes, its gap list and its readiness.

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let other: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let coach: TestAgent
let base: string
let ada: string
let bea: string
let outsider: string
let auditId: string
let before: { report: AuditReport; gapsCsv: string; headlineCsv: string }

const read = async () => ({
  report: (await director.get(`${base}/audits/${auditId}`).expect(200)).body as AuditReport,
  gapsCsv: (await director.get(`${base}/audits/${auditId}/gaps.csv`).expect(200)).text,
  headlineCsv: (await director.get(`${base}/audits/${auditId}/headline.csv`).expect(200)).text,
})
const erase = (agent: TestAgent, athleteId: string, body: unknown) =>
  agent.post(`${base}/athletes/${athleteId}/erase`).send(body as object)
const rowsOf = async (athleteId: string) => ({
  athletes: await database.db.select().from(athletes).where(eq(athletes.id, athleteId)),
  events: await database.db
    .select()
    .from(progressEvents)
    .where(eq(progressEvents.athleteId, athleteId)),
  records: await database.db
    .select()
    .from(progressRecords)
    .where(eq(progressRecords.athleteId, athleteId)),
})

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'erase')
  other = await clubWithPeople(database.db, 'erase-other')
  director = await signedIn(t, fx.people.director.email)
  coach = await signedIn(t, fx.people.coach.email)
  base = `/api/clubs/${fx.club.id}`
  const { backTuck, frontTuck } = await floorTucks(database.db, fx.club.id)
  const athlete = async (clubId: string, squadId: string, givenName: string, familyName: string) =>
    (
      await createAthlete(database.db, clubId, {
        givenName,
        familyName,
        birthYear: 2011,
        squadId,
        discipline: 'artistic-women',
      })
    ).id
  ada = await athlete(fx.club.id, fx.squad.id, 'Ada', 'Quillmere')
  bea = await athlete(fx.club.id, fx.squad.id, 'Bea', 'Harrowfield')
  outsider = await athlete(other.club.id, other.squad.id, 'Cora', 'Elsewhere')
  const step = (athleteId: string, elementId: string, stepIndex: number) => ({
    athleteId,
    elementId,
    coachId: fx.people.coach.id,
    change: { kind: 'step' as const, stepIndex, occurredOn: '2026-05-10', skipReason: 'Assessed' },
  })
  await appendHistory(database.db, fx.club.id, [
    step(ada, backTuck, 3),
    step(bea, backTuck, 1),
    step(bea, frontTuck, 1),
  ])
  // A correction of Ada's entry: an event pointing at another of hers.
  const record = (await director.get(`${base}/athletes/${ada}/records/${backTuck}`).expect(200))
    .body as RecordDetail
  await director
    .post(`${base}/athletes/${ada}/events`)
    .send({
      elementId: backTuck,
      kind: 'step',
      stepIndex: 3,
      occurredOn: '2026-05-11',
      skipReason: 'Assessed again',
      correctsEventId: record.lastEventId,
      expectedLastEventId: record.lastEventId,
    })
    .expect(201)
  auditId = await runAndStore(
    database.db,
    { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' },
    { squadId: null },
  )
  before = await read()
  // A club archive made before: it holds Ada's rows. The other club has one too.
  for (const clubId of [fx.club.id, other.club.id]) {
    const [archive] = await database.db
      .insert(clubArchives)
      .values({ clubId, status: 'done', expiresAt: new Date(Date.now() + 86_400_000) })
      .returning({ id: clubArchives.id })
    await database.db
      .insert(clubArchiveFiles)
      .values({ clubId, archiveId: archive!.id, bytes: Buffer.from('Ada Quillmere') })
  }
  // Recommendation mail not sent yet (the mail server down), about Ada and about Bea.
  for (const [who, name] of [
    [ada, 'Ada Quillmere'],
    [bea, 'Bea Harrowfield'],
  ] as const) {
    await database.db.insert(mailOutbox).values({
      to: 'coach-erase@test.example',
      subject: 'Club: a recommendation for an athlete of Squad A',
      text: `A recommendation for ${name} (Squad A): https://club.invalid/athletes/${who}`,
    })
  }
})
afterAll(async () => {
  await t.close()
  await database.close()
})

describe('POST /api/clubs/:clubId/athletes/:athleteId/erase', () => {
  it('is for directors only: a coach of the athlete’s squad gets 403 and nothing changes', async () => {
    const res = await erase(coach, ada, { confirmName: 'Ada Quillmere' })
    expect(res.status).toBe(403)
    expect((await rowsOf(ada)).athletes).toHaveLength(1)
  })

  it('refuses a confirmation that is not the athlete’s full name, naming the field', async () => {
    for (const body of [{ confirmName: 'ada quillmere' }, { confirmName: 'Ada' }, {}]) {
      const res = await erase(director, ada, body)
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.error.issues[0].path).toBe('confirmName')
    }
    const rows = await rowsOf(ada)
    expect(rows.athletes).toHaveLength(1)
    expect(rows.events).toHaveLength(2)
  })

  it('answers 404 for another club’s athlete, and leaves that athlete alone', async () => {
    const res = await erase(director, outsider, { confirmName: 'Cora Elsewhere' })
    expect(res.status).toBe(404)
    expect((await rowsOf(outsider)).athletes).toHaveLength(1)
  })

  it('deletes the athlete, their events (corrections included) and records in one go', async () => {
    expect(before.report.athleteNames[ada]).toBe('Ada Quillmere')
    expect(before.report.result.gaps.some((g) => g.athleteId === ada)).toBe(true)
    expect(before.report.result.readiness.some((r) => r.athleteId === ada)).toBe(true)

    await erase(director, ada, { confirmName: ' Ada Quillmere ' }).expect(204)
    expect(await rowsOf(ada)).toEqual({ athletes: [], events: [], records: [] })
    const kept = await rowsOf(bea)
    expect([kept.athletes.length, kept.events.length, kept.records.length]).toEqual([1, 2, 2])
    await director.get(`${base}/athletes/${ada}`).expect(404)
    await erase(director, ada, { confirmName: 'Ada Quillmere' }).expect(404)
  })

  it('deletes the club archives made before, which hold her rows; another club’s stay', async () => {
    const archivesOf = async (clubId: string) => ({
      archives: (await database.db.select().from(clubArchives)).filter((a) => a.clubId === clubId)
        .length,
      files: (await database.db.select().from(clubArchiveFiles)).filter((f) => f.clubId === clubId)
        .length,
    })
    expect(await archivesOf(fx.club.id)).toEqual({ archives: 0, files: 0 })
    expect(await archivesOf(other.club.id)).toEqual({ archives: 1, files: 1 })
  })

  it('drops mail about her not sent yet, and keeps the mail about others', async () => {
    const left = await database.db
      .select({ text: mailOutbox.text })
      .from(mailOutbox)
      .where(eq(mailOutbox.to, 'coach-erase@test.example'))
    expect(left.map((m) => m.text)).toEqual([
      `A recommendation for Bea Harrowfield (Squad A): https://club.invalid/athletes/${bea}`,
    ])
  })

  it('keeps the stored audit’s figures and rows, under a neutral label and a new id', async () => {
    const after = await read()
    const { report } = after
    const text = JSON.stringify(report)
    expect(text).not.toContain('Quillmere')
    expect(text).not.toContain(ada)
    expect(report.result.headline).toEqual(before.report.result.headline)
    expect(report.result.squads).toEqual(before.report.result.squads)
    expect(report.result.coverage).toEqual(before.report.result.coverage)
    expect(report.comparison).toEqual(before.report.comparison)
    // Every row still there, in the same order, with the same figures; only Ada's id changed.
    const newId = report.result.athletes.find((a) => !before.report.athleteNames[a.athleteId])!
    expect(newId.athleteId).not.toBe(ada)
    const swapped = JSON.parse(
      JSON.stringify(before.report.result).replaceAll(ada, newId.athleteId),
    )
    expect(report.result).toEqual(swapped)
    expect(report.athleteNames).toEqual({
      [bea]: 'Bea Harrowfield',
      [newId.athleteId]: erasedAthleteLabel,
    })
    // Nothing stored names her id any more.
    const [row] = await database.db
      .select({ result: audits.result })
      .from(audits)
      .where(and(eq(audits.clubId, fx.club.id), eq(audits.id, auditId)))
    expect(JSON.stringify(row!.result)).not.toContain(ada)
  })

  it('exports the same CSV rows with the neutral label where her name was, and the PDF too', async () => {
    const after = await read()
    expect(before.gapsCsv).toContain('Ada Quillmere')
    expect(after.gapsCsv).toBe(before.gapsCsv.replaceAll('Ada Quillmere', erasedAthleteLabel))
    expect(after.headlineCsv).toBe(before.headlineCsv)
    const pdf = reportPdfInput(after.report, fx.club.name)
    expect(Object.values(pdf.report.athleteNames)).toContain(erasedAthleteLabel)
    expect(JSON.stringify(pdf)).not.toContain('Quillmere')
    // Drawn anew after the erasure: the PDF holds the label, never her name.
    const { text } = readPdf(await drawnPdf(director, base, auditId))
    expect(text).toContain(erasedAthleteLabel)
    expect(text).not.toContain('Quillmere')
  })

  it('leaves the other club’s data and the other athletes untouched', async () => {
    const remaining = await database.db
      .select({ id: athletes.id })
      .from(athletes)
      .where(or(eq(athletes.clubId, fx.club.id), eq(athletes.clubId, other.club.id)))
    expect(remaining.map((r) => r.id).sort()).toEqual([bea, outsider].sort())
  })
})
