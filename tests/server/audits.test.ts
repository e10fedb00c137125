import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { and, eq, inArray } from 'drizzle-orm'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { mailOutbox } from '../../server/db/schema-accounts.ts'
import { audits } from '../../server/db/schema-audits.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { appendHistory } from '../../server/services/progress-history.ts'
import { createSquad } from '../../server/services/squads.ts'
import type { StoredAuditResult } from '../../server/services/audit-storage.ts'
import { gatherInputs } from '../../server/services/audit-inputs.ts'
import { auditInputHash } from '../../shared/domain/audit/hashing.ts'
import { auditFigures } from '../../shared/domain/audit/types.ts'
import type { AuditReport, BoardSummary } from '../../shared/schemas/audits.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'
import { drawnPdf } from '../support/report-pdf.ts'

// A worked example through the whole stack (events → replay as of a date → audit → stored
// report), computed by hand with the brief's formulas:
//   Ada: back tuck at step index 3 (p = 4/N), front tuck not started (p = 0)
//   Bea: back tuck at step index 1 (p = 2/N), front tuck at step index 1 (p = 2/N)
//   squad front-lag = 1 − (min(4/N, 0) + min(2/N, 2/N)) / (4/N + 2/N) = 1 − 2/6 = 2/3
//   balance ratio = Σ forward / Σ backward = (0 + 2/N) / (4/N + 2/N) = 1/3
// N, the number of steps, cancels out.

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let coach: TestAgent
let board: TestAgent
let base: string
const names = { ada: ['Ada', 'Quillmere'], bea: ['Bea', 'Harrowfield'] } as const
let ada: string
let bea: string
let backTuck: string
let frontTuck: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'audit')
  director = await signedIn(t, fx.people.director.email)
  coach = await signedIn(t, fx.people.coach.email)
  board = await signedIn(t, fx.people.board.email)
  base = `/api/clubs/${fx.club.id}`
  ;({ backTuck, frontTuck } = await floorTucks(database.db, fx.club.id))
  const athlete = async ([givenName, familyName]: readonly [string, string]) =>
    (
      await createAthlete(database.db, fx.club.id, {
        givenName,
        familyName,
        birthYear: 2011,
        squadId: fx.squad.id,
        discipline: 'artistic-women',
      })
    ).id
  ada = await athlete(names.ada)
  bea = await athlete(names.bea)
  const step = (athleteId: string, elementId: string, stepIndex: number, occurredOn: string) => ({
    athleteId,
    elementId,
    coachId: fx.people.coach.id,
    change: {
      kind: 'step' as const,
      stepIndex,
      occurredOn,
      ...(stepIndex > 0 ? { skipReason: 'Assessed' } : {}),
    },
  })
  await appendHistory(database.db, fx.club.id, [
    step(ada, backTuck, 3, '2026-05-10'),
    step(bea, backTuck, 1, '2026-05-10'),
    step(bea, frontTuck, 1, '2026-05-12'),
    // after the end of the second quarter: an audit as of 2026-06-30 must not see it
    step(ada, frontTuck, 3, '2026-07-15'),
  ])
})
afterAll(async () => {
  await t.close()
  await database.close()
})

async function runAudit(body: Record<string, unknown>) {
  const started = await director.post(`${base}/audits`).send(body)
  expect(started.status).toBe(202)
  let job = started.body
  for (let i = 0; i < 200 && job.status === 'running'; i++) {
    await new Promise((r) => setTimeout(r, 25))
    job = (await director.get(`${base}/audit-jobs/${job.id}`).expect(200)).body
  }
  expect(job.status).toBe('done')
  return (await director.get(`${base}/audits/${job.auditId}`).expect(200)).body as AuditReport
}

describe('running an audit', () => {
  let q2: AuditReport

  it('replays the records as of the end of a quarter and computes the brief’s figures', async () => {
    q2 = await runAudit({ squadId: null, quarter: '2026-Q2' })
    expect(q2.audit.asOf).toBe('2026-06-30')
    expect(q2.result.headline.clubFrontLag).toBeCloseTo(2 / 3, 10)
    expect(q2.result.headline.balanceRatio).toBeCloseTo(1 / 3, 10)
    expect(q2.result.headline.squadFrontLags[fx.squad.id]).toBeCloseTo(2 / 3, 10)
    expect(
      q2.result.gaps.map((g) => [g.athleteId, g.elementId, g.counterpartNeverStarted]),
    ).toEqual([[ada, backTuck, true]])
    expect(q2.athleteNames[ada]).toBe('Ada Quillmere')
    expect(q2.previous).toBeNull()
  })

  it('stores the gap list in its compact form and still reports full gap entries', async () => {
    const [row] = await database.db
      .select({ result: audits.result })
      .from(audits)
      .where(and(eq(audits.clubId, fx.club.id), eq(audits.id, q2.audit.id)))
    const stored = row!.result as StoredAuditResult
    expect(stored.format).toBe(2)
    const adaAt = stored.athletes.findIndex((a) => a.athleteId === ada)
    expect(adaAt).toBeGreaterThanOrEqual(0)
    // back tuck at step index 3, front tuck never started: 3 − (−1) = 4 steps on equal progressions
    expect(stored.gaps).toEqual([[adaAt, 0, 3, null, 4]])
    expect(stored.gapElements).toEqual([
      {
        id: backTuck,
        // The standard catalogue has a back tuck on tumbling too: the name says which.
        name: 'Back tuck (floor)',
        rotationClass: 'single',
        counterpartId: frontTuck,
        counterpartName: 'Front tuck (floor)',
        stepCount: 8,
        counterpartStepCount: 8,
      },
    ])
    expect(q2.result.gaps).toStrictEqual([
      {
        athleteId: ada,
        squadId: fx.squad.id,
        elementId: backTuck,
        elementName: 'Back tuck (floor)',
        rotationClass: 'single',
        counterpartId: frontTuck,
        counterpartName: 'Front tuck (floor)',
        stepIndex: 3,
        counterpartStepIndex: null,
        deficitSteps: 4,
        weight: 1,
        weightedDeficit: 4,
        counterpartMissing: false,
        counterpartNeverStarted: true,
        // Both tucks have eight steps in the fixture: the list reads "step 4 of 8".
        stepCount: 8,
        counterpartStepCount: 8,
      },
    ])
  })

  it('compresses stored results with lz4 where the server has it, quicker to write than pglz', async () => {
    // PostgreSQL 15 manual, ALTER TABLE … SET COMPRESSION: 'l' in pg_attribute.attcompression
    // is lz4, 'p' pglz and '' the server's default. A server built without lz4 refuses it as a
    // setting too, and then the migration leaves the default.
    const client = await database.pool.connect()
    let hasLz4 = true
    try {
      await client.query(`set default_toast_compression = 'lz4'`)
    } catch {
      hasLz4 = false
    } finally {
      await client.query('reset default_toast_compression').catch(() => undefined)
      client.release()
    }
    const { rows } = await database.pool.query<{ attcompression: string }>(
      `select attcompression from pg_attribute
        where attrelid = 'audits'::regclass and attname = 'result'`,
    )
    expect(rows).toHaveLength(1)
    if (hasLz4) expect(rows[0]!.attcompression).toBe('l')
    else expect(['', 'p']).toContain(rows[0]!.attcompression)
  })

  it('reads an audit stored whole, before the compact form existed, as it was written', async () => {
    const [row] = await database.db
      .insert(audits)
      .values({
        clubId: fx.club.id,
        squadId: fx.squad.id,
        asOf: q2.audit.asOf,
        inputHash: q2.audit.inputHash,
        result: q2.result,
        figures: auditFigures(q2.result),
      })
      .returning({ id: audits.id })
    const legacy = (await director.get(`${base}/audits/${row!.id}`).expect(200)).body as AuditReport
    expect(legacy.result).toStrictEqual(q2.result)
    const csv = await director.get(`${base}/audits/${row!.id}/gaps.csv`).expect(200)
    expect(csv.text).toContain(
      '1,Ada Quillmere,Squad A,Back tuck (floor),4,Front tuck (floor),,4,4',
    )
  })

  it('gives the same hash and numbers over the same inputs', async () => {
    const again = await runAudit({ squadId: null, asOf: '2026-06-30' })
    expect(again.audit.inputHash).toBe(q2.audit.inputHash)
    expect(again.result.headline).toEqual(q2.result.headline)
    expect(
      (await director.post(`${base}/audits/${q2.audit.id}/recheck`).expect(200)).body.unchanged,
    ).toBe(true)
  })

  it('re-checks an audit by the hash version it was stored with', async () => {
    const [stored] = await database.db
      .select({ hashVersion: audits.hashVersion })
      .from(audits)
      .where(and(eq(audits.clubId, fx.club.id), eq(audits.id, q2.audit.id)))
    expect(stored!.hashVersion).toBe(2)
    // An audit stored before version 2: its hash is the first version's over the same inputs.
    const inputs = await gatherInputs(database.db, fx.club.id, null, q2.audit.asOf)
    const made: string[] = []
    const older = async (inputHash: string) => {
      const [row] = await database.db
        .insert(audits)
        .values({
          clubId: fx.club.id,
          squadId: null,
          asOf: q2.audit.asOf,
          inputHash,
          result: q2.result,
          figures: auditFigures(q2.result),
        })
        .returning({ id: audits.id })
      made.push(row!.id)
      return (await director.post(`${base}/audits/${row!.id}/recheck`).expect(200)).body as {
        unchanged: boolean
      }
    }
    expect((await older(await auditInputHash(inputs, {}, 1))).unchanged).toBe(true)
    // The same inputs hashed the second way do not match a first-version row.
    expect((await older(q2.audit.inputHash)).unchanged).toBe(false)
    // A version this release does not know (stored by a later one) is refused, not guessed.
    await database.db
      .update(audits)
      .set({ hashVersion: 3 })
      .where(and(eq(audits.clubId, fx.club.id), eq(audits.id, made[0]!)))
    const refused = await director.post(`${base}/audits/${made[0]}/recheck`).expect(409)
    expect(refused.body.error.code).toBe('hash_version_unknown')
    await database.db
      .delete(audits)
      .where(and(eq(audits.clubId, fx.club.id), inArray(audits.id, made)))
  })

  it('sees later events in a later audit, compares with the previous one, and charts the trend', async () => {
    const today = await runAudit({ squadId: null })
    // Ada's front tuck now matches her back tuck: front-lag 1 − (4/N + 2/N) / (6/N) = 0
    expect(today.result.headline.clubFrontLag).toBeCloseTo(0, 10)
    expect(today.audit.inputHash).not.toBe(q2.audit.inputHash)
    expect(today.previous?.asOf).toBe('2026-06-30')
    expect(today.comparison.clubFrontLag.change).toBeCloseTo(-2 / 3, 10)
    // one point per date: the second run as of 2026-06-30 replaces the first
    expect(today.trend.map((p) => p.asOf)).toEqual(['2026-06-30', today.audit.asOf])
  })

  it('tells when the inputs changed after the audit (a back-dated correction)', async () => {
    await appendHistory(database.db, fx.club.id, [
      {
        athleteId: bea,
        elementId: frontTuck,
        coachId: fx.people.coach.id,
        change: { kind: 'step', stepIndex: 2, occurredOn: '2026-06-01' },
      },
    ])
    const res = (await director.post(`${base}/audits/${q2.audit.id}/recheck`).expect(200)).body
    expect(res.unchanged).toBe(false)
    // the stored audit itself never changes
    const stored = (await director.get(`${base}/audits/${q2.audit.id}`).expect(200))
      .body as AuditReport
    expect(stored.result.headline.clubFrontLag).toBeCloseTo(2 / 3, 10)
  })

  it('sends the report compressed to a browser that accepts it', async () => {
    const res = await director
      .get(`${base}/audits/${q2.audit.id}`)
      .set('Accept-Encoding', 'gzip')
      .expect(200)
    expect(res.headers['content-encoding']).toBe('gzip')
    expect((res.body as AuditReport).audit.id).toBe(q2.audit.id)
  })

  it('refuses a date still to come, naming the field', async () => {
    const res = await director.post(`${base}/audits`).send({ squadId: null, asOf: '2999-01-01' })
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('asOf')
  })

  it('exports the gap list and the headline figures as CSV and the report as a PDF', async () => {
    const gaps = await coach.get(`${base}/audits/${q2.audit.id}/gaps.csv`).expect(200)
    expect(gaps.text.split(/\r?\n/)[0]).toBe(
      'rank,athlete,squad,backwardElement,backwardStep,forwardElement,forwardStep,deficitSteps,weightedDeficit',
    )
    expect(gaps.text).toContain('1,Ada Quillmere,Squad A,Back tuck (floor),4,Front tuck (floor),,')
    // The file name says the scope (the club, for a club audit) and the date.
    expect(gaps.headers['content-disposition']).toBe(
      'attachment; filename="gaps-test-club-audit-2026-06-30.csv"',
    )
    const headline = await coach.get(`${base}/audits/${q2.audit.id}/headline.csv`).expect(200)
    expect(headline.headers['content-disposition']).toBe(
      'attachment; filename="headline-test-club-audit-2026-06-30.csv"',
    )
    // Front-lag 2/3 (worked at the top of this file) as a percentage to one decimal: 66.7 %.
    expect(headline.text).toContain('front-lag,66.7,%,')
    expect(headline.text.split(/\r?\n/)[0]).toBe('figure,value,unit,changeSincePrevious,changeUnit')
    const pdf = await drawnPdf(director, base, q2.audit.id)
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
  })
})

/** The notices queued for the board member about the audit as of `asOf`. */
async function boardNotices(asOf: string) {
  const rows = await database.db
    .select({ subject: mailOutbox.subject })
    .from(mailOutbox)
    .where(eq(mailOutbox.to, fx.people.board.email))
  return rows.filter((r) => r.subject.endsWith(`the audit as of ${asOf} is ready`)).length
}

describe('publishing and the board', () => {
  it('e-mails the board a notice with a link, and the board sees aggregates only', async () => {
    const report = await runAudit({ squadId: null, asOf: '2026-06-30' })
    const published = await director.post(`${base}/audits/${report.audit.id}/publish`).expect(200)
    expect(published.body.notified).toBe(1)
    const mail = await t.mailer.fake!.waitFor(fx.people.board.email)
    expect(mail.subject).toContain('the audit as of 2026-06-30 is ready')
    expect(mail.text).toMatch(/http:\/\/127\.0\.0\.1:\d+\/board/)
    // Asked again (a retry after a lost answer): the audit as published, nobody e-mailed twice.
    const again = await director.post(`${base}/audits/${report.audit.id}/publish`).expect(200)
    expect(again.body).toMatchObject({
      id: report.audit.id,
      publishedAt: published.body.publishedAt,
      notified: 0,
      alreadyPublished: true,
    })
    expect(await boardNotices(report.audit.asOf)).toBe(1)

    const summary = (await board.get(`${base}/board-summary`).expect(200)).body as BoardSummary
    expect(summary.latest?.clubFrontLag).toBeCloseTo(2 / 3, 10)
    expect(summary.latest?.squads).toEqual([
      { name: 'Squad A', frontLag: expect.any(Number), athleteCount: 2 },
    ])
  })

  it('publishes once and tells the board once when two publishes arrive together', async () => {
    // The date of the audits around it, so that the board's trend stays as they expect it.
    const report = await runAudit({ squadId: null, asOf: '2026-06-30' })
    const before = await boardNotices('2026-06-30')
    const [first, second] = await Promise.all(
      [0, 1].map(() => director.post(`${base}/audits/${report.audit.id}/publish`).expect(200)),
    )
    const outcomes = [first!.body.alreadyPublished, second!.body.alreadyPublished].sort()
    expect(outcomes).toEqual([false, true])
    expect(first!.body.publishedAt).toBe(second!.body.publishedAt)
    expect((await boardNotices('2026-06-30')) - before).toBe(1)
  })

  it('shows the board one point per date when an audit of the same day is published again', async () => {
    const again = await runAudit({ squadId: null, asOf: '2026-06-30' })
    await director.post(`${base}/audits/${again.audit.id}/publish`).expect(200)
    const summary = (await board.get(`${base}/board-summary`).expect(200)).body as BoardSummary
    expect(summary.trend.map((p) => p.asOf)).toEqual(['2026-06-30'])
    expect(summary.latest?.publishedAt).toBeDefined()
  })

  it('lets the board reach no athlete-level data in any response', async () => {
    const forbidden = [ada, bea, ...Object.values(names).flat(), '2011']
    const reachable = t.clubRoutes
      .filter((r) => r.method === 'get' && r.allow.includes('board'))
      .map((r) => r.path)
    expect(reachable.sort()).toEqual(['/', '/board-summary'])
    const bodies = [
      ...(await Promise.all(
        reachable.map(async (path) => (await board.get(`${base}${path}`)).text),
      )),
      (await board.get('/api/auth/me')).text,
    ]
    // every other club route answers the board with a refusal that carries no data
    for (const route of t.clubRoutes.filter((r) => !r.allow.includes('board'))) {
      const path = route.path.replace(/:[a-zA-Z]+/g, crypto.randomUUID())
      const res = await (board as unknown as Record<string, (url: string) => request.Test>)[
        route.method
      ]!(`${base}${path}`)
      expect([403, 404]).toContain(res.status)
      bodies.push(res.text)
    }
    for (const body of bodies) for (const secret of forbidden) expect(body).not.toContain(secret)
  })

  it('limits the report’s athlete rows to a coach’s own squads', async () => {
    const elsewhere = await createSquad(database.db, fx.club.id, {
      name: 'Not the coach’s',
      level: 'junior',
      discipline: 'artistic-women',
    })
    const other = (
      await createAthlete(database.db, fx.club.id, {
        givenName: 'Cora',
        familyName: 'Elsewhere',
        birthYear: 2011,
        squadId: elsewhere.id,
        discipline: 'artistic-women',
      })
    ).id
    await appendHistory(database.db, fx.club.id, [
      {
        athleteId: other,
        elementId: backTuck,
        coachId: fx.people.director.id,
        change: { kind: 'step', stepIndex: 0, occurredOn: '2026-06-01' },
      },
    ])
    const report = await runAudit({ squadId: null })
    const asCoach = (await coach.get(`${base}/audits/${report.audit.id}`).expect(200))
      .body as AuditReport
    expect(asCoach.limitedToSquads).toBe(true)
    expect(asCoach.result.gaps.some((g) => g.athleteId === other)).toBe(false)
    expect(Object.keys(asCoach.athleteNames)).not.toContain(other)
    expect(report.result.gaps.some((g) => g.athleteId === other)).toBe(true)
  })
})

describe('one change figure for the director and the board', () => {
  it('measures a published audit from the last published one of an earlier date, for both', async () => {
    // A squad whose one athlete has no record: no data, left out of the board's bars.
    const quiet = await createSquad(database.db, fx.club.id, {
      name: 'Quiet squad',
      level: 'junior',
      discipline: 'artistic-women',
    })
    await createAthlete(database.db, fx.club.id, {
      givenName: 'Nell',
      familyName: 'Ashcombe',
      birthYear: 2015,
      squadId: quiet.id,
      discipline: 'artistic-women',
    })
    const latest = await runAudit({ squadId: null })
    await director.post(`${base}/audits/${latest.audit.id}/publish`).expect(200)
    // the same date run again: a re-run, compared with the earlier date, not with itself
    const rerun = await runAudit({ squadId: null, asOf: latest.audit.asOf })
    expect(rerun.audit.rerun).toBe(true)
    expect(rerun.previous!.asOf < rerun.audit.asOf).toBe(true)
    expect(rerun.trend.filter((p) => p.asOf === rerun.audit.asOf)).toHaveLength(1)
    expect(new Set(rerun.trend.map((p) => p.asOf)).size).toBe(rerun.trend.length)

    const report = (await director.get(`${base}/audits/${latest.audit.id}`).expect(200))
      .body as AuditReport
    // the last audit published before: the board's 2026-06-30 one
    expect(report.previous?.asOf).toBe('2026-06-30')
    expect(report.previous?.publishedAt).not.toBeNull()
    const summary = (await board.get(`${base}/board-summary`).expect(200)).body as BoardSummary
    expect(summary.latest?.asOf).toBe(latest.audit.asOf)
    const { squadFrontLags: _bySquad, ...directorChanges } = report.comparison
    expect(summary.latest?.comparison).toEqual(directorChanges)
    expect(summary.latest?.clubBackLag).toBe(report.result.headline.clubBackLag)

    // the quiet squad: no data in the report, not a bar on the board, counted apart
    const quietRow = report.result.squads.find((s) => s.squadId === quiet.id)!
    expect(quietRow).toMatchObject({ athleteCount: 1, athletesWithRecords: 0, frontLag: null })
    expect(summary.latest?.squads.map((s) => s.name)).not.toContain('Quiet squad')
    expect(summary.latest?.squadsWithoutRecords).toBe(1)
    expect(report.result.headline.squadsWithoutRecords).toBe(1)
  })
})
