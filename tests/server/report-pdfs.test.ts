import { and, count, eq } from 'drizzle-orm'
import pino from 'pino'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { purgeExpired } from '../../server/auth/purge.ts'
import type { Database } from '../../server/db/client.ts'
import { reportPdfFiles, reportPdfs } from '../../server/db/schema-audits.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { appendHistory } from '../../server/services/progress-history.ts'
import { processReportPdf, reportPdfLifetimeMs } from '../../server/services/report-pdfs.ts'
import { assignCoach, createSquad } from '../../server/services/squads.ts'
import type { ReportPdfJob } from '../../shared/schemas/report-pdfs.ts'
import { readPdf } from '../e2e/support-files.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { freshDatabase } from '../support/database.ts'
import { clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'
import { downloadPdf, settledPdf } from '../support/report-pdf.ts'

// Drawing can be made to fail a given number of times, as a worker that crashes mid-way would.
const drawing = vi.hoisted(() => ({ failures: 0, calls: 0 }))
vi.mock('../../server/services/report-pdf-pool.ts', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../server/services/report-pdf-pool.ts')>()
  return {
    ...real,
    drawReportPdf: async (...args: Parameters<typeof real.drawReportPdf>) => {
      drawing.calls++
      if (drawing.failures > 0) {
        drawing.failures--
        throw new Error('the drawing thread died')
      }
      return real.drawReportPdf(...args)
    },
  }
})

let database: Database
let t: TestApp
/** A second web process on the same database, with no worker of its own. */
let web2: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let other: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let base: string
let auditId: string
let asOf: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  web2 = await testApp(database, { worker: false })
  fx = await clubWithPeople(database.db, 'pdfjobs')
  other = await clubWithPeople(database.db, 'pdfother')
  director = await signedIn(t, fx.people.director.email)
  base = `/api/clubs/${fx.club.id}`
  // Ada trains in the coach's squad, Bea in one the coach does not take; each has a backward
  // element without its forward counterpart, so each is a gap the report names.
  const squadB = await createSquad(database.db, fx.club.id, {
    name: 'Squad B',
    level: 'junior',
    discipline: 'artistic-women',
  })
  const { backTuck } = await floorTucks(database.db, fx.club.id)
  const history = []
  for (const [givenName, familyName, squadId] of [
    ['Ada', 'Quillmere', fx.squad.id],
    ['Bea', 'Harrowfield', squadB.id],
  ] as const) {
    const athlete = await createAthlete(database.db, fx.club.id, {
      givenName,
      familyName,
      birthYear: 2012,
      squadId,
      discipline: 'artistic-women',
    })
    history.push({
      athleteId: athlete.id,
      elementId: backTuck,
      coachId: fx.people.coach.id,
      change: { kind: 'step' as const, stepIndex: 0, occurredOn: '2026-05-10' },
    })
  }
  await appendHistory(database.db, fx.club.id, history)
  auditId = await newAudit()
  asOf = (await director.get(`${base}/audits/${auditId}`).expect(200)).body.audit.asOf
})
afterAll(async () => {
  await web2.close()
  await t.close()
  await database.close()
})

const newAudit = () =>
  runAndStore(
    database.db,
    { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' },
    { squadId: null },
  )

const ask = (agent: TestAgent, audit = auditId) =>
  agent.post(`${base}/audits/${audit}/report-pdfs`).expect(202)

const settled = (agent: TestAgent, id: string) => settledPdf(agent, base, id)
const download = (agent: TestAgent, id: string) => downloadPdf(agent, base, id)

const rowsOf = async (auditIdOf = auditId) =>
  (
    await database.db
      .select({ n: count() })
      .from(reportPdfs)
      .where(and(eq(reportPdfs.clubId, fx.club.id), eq(reportPdfs.auditId, auditIdOf)))
  )[0]!.n

describe('POST /api/clubs/:clubId/audits/:id/report-pdfs', () => {
  it('is taken by a web process without a worker, drawn by a worker elsewhere, and polled from either', async () => {
    const directorOn2 = await signedIn(web2, fx.people.director.email)
    const sends = vi.spyOn(web2.context.jobs, 'send')
    const started = (await ask(directorOn2)).body as ReportPdfJob
    expect(started).toMatchObject({ auditId, status: 'running', phase: 'queued', bytes: null })
    expect(sends).toHaveBeenCalledTimes(1)
    sends.mockRestore()

    const { job, seen } = await settled(directorOn2, started.id)
    expect(job).toMatchObject({ status: 'done', phase: 'done', done: 2, total: 2 })
    expect(job.bytes).toBeGreaterThan(1_000)
    // Progress only moves forward.
    const done = seen.map((j) => j.done)
    expect(done).toEqual([...done].sort((a, b) => a - b))
    expect((await director.get(`${base}/report-pdfs/${started.id}`).expect(200)).body).toEqual(job)

    const res = await download(director, started.id).expect(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    expect(res.headers['content-disposition']).toBe(`attachment; filename="audit-${asOf}.pdf"`)
    const bytes = res.body as Buffer
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    expect(bytes.length).toBe(job.bytes)
    const { text } = readPdf(bytes)
    expect(text).toContain(`${fx.club.name}: forward/backward audit`)
    expect(text).toContain('Quillmere')
    expect(text).toContain('Harrowfield')
  })

  it('answers the same PDF to the same ask while it is drawn or fresh, and draws anew after a new audit', async () => {
    const audit = await newAudit()
    const [a, b] = await Promise.all([ask(director, audit), ask(director, audit)])
    expect(b.body.id).toBe(a.body.id)
    await settled(director, a.body.id)
    expect((await ask(director, audit)).body).toMatchObject({ id: a.body.id, status: 'done' })
    expect(await rowsOf(audit)).toBe(1)

    // A newer audit changes the trend this report draws.
    await newAudit()
    const fresh = (await ask(director, audit)).body as ReportPdfJob
    expect(fresh.id).not.toBe(a.body.id)
    expect(await rowsOf(audit)).toBe(2)
    await settled(director, fresh.id)
  })

  it('draws a coach the squads they coach only, and hands each PDF to the one who asked', async () => {
    const coach = await signedIn(t, fx.people.coach.email)
    const mine = (await ask(coach)).body as ReportPdfJob
    expect((await settled(coach, mine.id)).job.status).toBe('done')
    const { text } = readPdf((await download(coach, mine.id).expect(200)).body as Buffer)
    expect(text).toContain('Quillmere')
    expect(text).not.toContain('Harrowfield')

    // The director's render of the same audit is not the coach's, nor the coach's theirs.
    const directors = (await ask(director)).body as ReportPdfJob
    expect(directors.id).not.toBe(mine.id)
    await director.get(`${base}/report-pdfs/${mine.id}`).expect(404)
    await download(director, mine.id).expect(404)
    await coach.get(`${base}/report-pdfs/${directors.id}`).expect(404)

    // Given another squad since, the coach's PDF no longer matches what they read.
    const squad = await createSquad(database.db, fx.club.id, {
      name: 'Squad C',
      level: 'senior',
      discipline: 'artistic-women',
    })
    await assignCoach(database.db, fx.club.id, squad.id, fx.people.coach.id)
    const stale = await coach.get(`${base}/report-pdfs/${mine.id}/download`).expect(410)
    expect(stale.body.error.code).toBe('report_pdf_expired')
  })

  it('hides everything from another club, and answers 404 for unknown or malformed ids', async () => {
    const job = (await ask(director)).body as ReportPdfJob
    const outsider = await signedIn(t, other.people.director.email)
    await outsider.post(`${base}/audits/${auditId}/report-pdfs`).expect(404)
    await outsider.get(`${base}/report-pdfs/${job.id}`).expect(404)
    await outsider.get(`${base}/report-pdfs/${job.id}/download`).expect(404)
    const theirs = `/api/clubs/${other.club.id}`
    await outsider.post(`${theirs}/audits/${auditId}/report-pdfs`).expect(404)
    await outsider.get(`${theirs}/report-pdfs/${job.id}`).expect(404)
    await outsider.get(`${theirs}/report-pdfs/${job.id}/download`).expect(404)
    for (const path of [
      `${base}/report-pdfs/not-a-uuid`,
      `${base}/report-pdfs/not-a-uuid/download`,
      `${base}/report-pdfs/${crypto.randomUUID()}`,
    ]) {
      expect((await director.get(path).expect(404)).body.error.code).toBe('not_found')
    }
    const none = await director.post(`${base}/audits/${crypto.randomUUID()}/report-pdfs`)
    expect(none.status).toBe(404)
    expect(none.body.error.message).toBe('No such audit.')
    await director.post(`${base}/audits/not-a-uuid/report-pdfs`).expect(404)
  })
})

/** A PDF report's row as asking stores it, with no job sent: the test plays the worker. */
const unsentPdf = async () =>
  (
    await database.db
      .insert(reportPdfs)
      .values({
        clubId: fx.club.id,
        auditId,
        requestedBy: fx.people.director.id,
        expiresAt: new Date(Date.now() + 60_000),
      })
      .returning()
  )[0]

/** Waits for every PDF asked for so far to be drawn, so that a made-up failure hits the next. */
async function noneRunning() {
  for (;;) {
    const [running] = await database.db
      .select({ n: count() })
      .from(reportPdfs)
      .where(eq(reportPdfs.status, 'running'))
    if (running!.n === 0) return
    await new Promise((r) => setTimeout(r, 50))
  }
}

describe('drawing a PDF report on a worker', () => {
  beforeAll(noneRunning, 20_000)

  it('is retried after a failed attempt, and then finishes', async () => {
    drawing.failures = 1
    drawing.calls = 0
    const job = (await ask(director, await newAudit())).body as ReportPdfJob
    const { job: finished } = await settled(director, job.id)
    expect(finished.status).toBe('done')
    expect(drawing.calls).toBe(2)
    const res = await download(director, job.id).expect(200)
    expect((res.body as Buffer).subarray(0, 5).toString('latin1')).toBe('%PDF-')
  })

  it('fails with a message the person can act on once the last attempt fails', async () => {
    const row = await unsentPdf()
    drawing.failures = 1
    const job = { clubId: fx.club.id, reportPdfId: row!.id, lastAttempt: true }
    await processReportPdf(database.db, pino({ level: 'silent' }), job)
    const { job: failed } = await settled(director, row!.id)
    expect(failed.status).toBe('failed')
    expect(failed.error).toMatch(/Try again/)
    const res = await director.get(`${base}/report-pdfs/${row!.id}/download`).expect(409)
    expect(res.body.error.code).toBe('report_pdf_not_ready')
  })

  it('stores the PDF once when two workers draw it', async () => {
    const row = await unsentPdf()
    const job = { clubId: fx.club.id, reportPdfId: row!.id, lastAttempt: false }
    const logger = pino({ level: 'silent' })
    await Promise.all([
      processReportPdf(database.db, logger, job),
      processReportPdf(database.db, logger, job),
    ])
    const [files] = await database.db
      .select({ n: count() })
      .from(reportPdfFiles)
      .where(eq(reportPdfFiles.reportPdfId, row!.id))
    expect(files!.n).toBe(1)
  })
})

describe('the life of a PDF report', () => {
  it('is kept an hour: then 410, reads as expired, and the purge deletes it and its bytes', async () => {
    const job = (await ask(director, await newAudit())).body as ReportPdfJob
    await settled(director, job.id)
    const where = and(eq(reportPdfs.clubId, fx.club.id), eq(reportPdfs.id, job.id))
    const [row] = await database.db.select().from(reportPdfs).where(where)
    expect(row!.expiresAt.getTime() - row!.finishedAt!.getTime()).toBe(reportPdfLifetimeMs)
    expect(reportPdfLifetimeMs).toBe(60 * 60 * 1000)
    await database.db
      .update(reportPdfs)
      .set({ expiresAt: new Date(Date.now() - 1_000) })
      .where(where)
    const gone = await director.get(`${base}/report-pdfs/${job.id}/download`).expect(410)
    expect(gone.body.error.code).toBe('report_pdf_expired')
    expect((await director.get(`${base}/report-pdfs/${job.id}`).expect(200)).body.status).toBe(
      'expired',
    )
    // An expired PDF is not handed out again: the same ask draws anew.
    expect((await ask(director, job.auditId)).body.id).not.toBe(job.id)

    const purged = await purgeExpired(database.db)
    expect(purged.reportPdfs).toBeGreaterThanOrEqual(1)
    expect(await database.db.select().from(reportPdfs).where(where)).toEqual([])
    const bytes = await database.db
      .select({ id: reportPdfFiles.reportPdfId })
      .from(reportPdfFiles)
      .where(eq(reportPdfFiles.reportPdfId, job.id))
    expect(bytes).toEqual([])
    await director.get(`${base}/report-pdfs/${job.id}`).expect(404)
  })

  it('is deleted with the club’s others when an athlete is erased, since it may name them', async () => {
    const job = (await ask(director)).body as ReportPdfJob
    await settled(director, job.id)
    const athlete = await createAthlete(database.db, fx.club.id, {
      givenName: 'Cai',
      familyName: 'Ormsby',
      birthYear: 2013,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
    await director
      .post(`${base}/athletes/${athlete.id}/erase`)
      .send({ confirmName: 'Cai Ormsby' })
      .expect((res) => expect(res.status).toBeLessThan(300))
    await director.get(`${base}/report-pdfs/${job.id}`).expect(404)
    const left = await database.db
      .select({ n: count() })
      .from(reportPdfFiles)
      .where(eq(reportPdfFiles.clubId, fx.club.id))
    expect(left[0]!.n).toBe(0)
  })
})
