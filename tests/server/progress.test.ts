import { count, eq } from 'drizzle-orm'
import Papa from 'papaparse'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type TestAgent from 'supertest/lib/agent.js'
import type { Database } from '../../server/db/client.ts'
import { athletes, progressEvents } from '../../server/db/schema-athletes.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { createSquad } from '../../server/services/squads.ts'
import { safetyCaution } from '../../shared/domain/element.ts'
import type { CatalogueElement } from '../../shared/schemas/elements.ts'
import type { Grid } from '../../shared/schemas/progress.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { scheduleVisit } from '../support/visits.ts'
import { clubWithPeople, signedIn } from '../support/fixtures.ts'

let database: Database
let t: TestApp
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let director: TestAgent
let coach: TestAgent
let clinician: TestAgent
let board: TestAgent
let base: string
let catalogue: CatalogueElement[]

const find = (direction: string, q: number, twists: number[], shape: string, apparatus = 'floor') =>
  catalogue.find(
    (e) =>
      e.apparatus === apparatus &&
      e.direction === direction &&
      e.quarterRotations === q &&
      e.twists.join() === twists.join() &&
      e.shape === shape,
  )!

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'progress')
  director = await signedIn(t, fx.people.director.email)
  coach = await signedIn(t, fx.people.coach.email)
  clinician = await signedIn(t, fx.people.clinician.email)
  board = await signedIn(t, fx.people.board.email)
  base = `/api/clubs/${fx.club.id}`
  catalogue = (await director.get(`${base}/elements`).expect(200)).body
})
afterAll(async () => {
  await t.close()
  await database.close()
})

async function newAthlete(squadId = fx.squad.id) {
  return createAthlete(database.db, fx.club.id, {
    givenName: 'Bea',
    familyName: `Thornwell ${Math.random().toString(36).slice(2, 7)}`,
    birthYear: 2012,
    squadId,
    discipline: 'artistic-women',
  })
}

interface Last {
  lastEventId: string | null
}
async function log(
  agent: TestAgent,
  athleteId: string,
  body: Record<string, unknown>,
  expected: Last | null = null,
) {
  return agent
    .post(`${base}/athletes/${athleteId}/events`)
    .send({ occurredOn: '2026-11-02', expectedLastEventId: expected?.lastEventId ?? null, ...body })
}

describe('logging progress', () => {
  it('derives the current step from the events, a correction voiding a mistaken one', async () => {
    const athlete = await newAthlete()
    const backTuck = find('backward', 4, [0], 'tuck')
    const first = await log(coach, athlete.id, {
      elementId: backTuck.id,
      kind: 'step',
      stepIndex: 0,
      occurredOn: '2026-09-01',
    })
    expect(first.status).toBe(201)
    expect(first.body.record).toMatchObject({ stepIndex: 0, highestStepIndex: 0 })
    const second = await log(
      coach,
      athlete.id,
      { elementId: backTuck.id, kind: 'step', stepIndex: 1, occurredOn: '2026-10-01' },
      first.body.record,
    )
    expect(second.body.record.stepIndex).toBe(1)

    const detail = (
      await coach.get(`${base}/athletes/${athlete.id}/records/${backTuck.id}`).expect(200)
    ).body
    const mistaken = detail.events.find((e: { stepIndex: number }) => e.stepIndex === 1)
    const corrected = await log(
      coach,
      athlete.id,
      {
        elementId: backTuck.id,
        kind: 'step',
        stepIndex: 0,
        correctsEventId: mistaken.id,
        occurredOn: '2026-10-01',
        note: 'Entered on the wrong athlete',
      },
      second.body.record,
    )
    expect(corrected.status).toBe(201)
    expect(corrected.body.record.stepIndex).toBe(0)
    const after = (
      await coach.get(`${base}/athletes/${athlete.id}/records/${backTuck.id}`).expect(200)
    ).body
    expect(after.events).toHaveLength(3)
    expect(after.events.find((e: { id: string }) => e.id === mistaken.id).voided).toBe(true)
  })

  it('needs a stated reason to skip a step, and keeps the flag with the record', async () => {
    const athlete = await newAthlete()
    const frontTuck = find('forward', 4, [0], 'tuck')
    const refused = await log(coach, athlete.id, {
      elementId: frontTuck.id,
      kind: 'step',
      stepIndex: 2,
    })
    expect(refused.status).toBe(400)
    expect(refused.body.error.code).toBe('reason_required')
    expect(refused.body.error.issues[0].path).toBe('skipReason')
    expect(refused.body.error.message).toMatch(/skips/)

    const preview = await coach
      .post(`${base}/athletes/${athlete.id}/events/check`)
      .send({
        elementId: frontTuck.id,
        kind: 'step',
        stepIndex: 2,
        occurredOn: '2026-11-02',
        skipReason: 'Had it at her old club',
        expectedLastEventId: null,
      })
      .expect(200)
    expect(preview.body.checks.map((c: { code: string }) => c.code)).toEqual(['skipped-step'])

    const saved = await log(coach, athlete.id, {
      elementId: frontTuck.id,
      kind: 'step',
      stepIndex: 2,
      skipReason: 'Had it at her old club',
    })
    expect(saved.status).toBe(201)
    expect(saved.body.checks[0]).toMatchObject({ code: 'skipped-step', severity: 'warning' })
    expect(saved.body.record.flagged).toBe(true)
    const detail = (
      await coach.get(`${base}/athletes/${athlete.id}/records/${frontTuck.id}`).expect(200)
    ).body
    expect(detail.events[0].checks[0].code).toBe('skipped-step')
  })

  it('flags a step passed sooner than its minimum days', async () => {
    const athlete = await newAthlete()
    const backPike = find('backward', 4, [0], 'pike')
    const detail = (await director.get(`${base}/elements/${backPike.id}`).expect(200)).body
    const index = detail.steps.findIndex((s: { minDays?: number | null }) => (s.minDays ?? 0) > 1)
    expect(index).toBeGreaterThanOrEqual(0)
    const reached = await log(coach, athlete.id, {
      elementId: backPike.id,
      kind: 'step',
      stepIndex: index,
      occurredOn: '2026-11-01',
      skipReason: index > 0 ? 'Assessed on arrival' : undefined,
    })
    const early = await log(
      coach,
      athlete.id,
      { elementId: backPike.id, kind: 'step', stepIndex: index + 1, occurredOn: '2026-11-02' },
      reached.body.record,
    )
    expect(early.status).toBe(201)
    expect(early.body.checks.map((c: { code: string }) => c.code)).toContain('min-days')
    expect(early.body.record.flagged).toBe(true)
  })

  it('flags unmet prerequisites', async () => {
    const athlete = await newAthlete()
    const single = find('backward', 4, [0], 'tuck', 'trampoline')
    const double = find('backward', 8, [0, 0], 'tuck', 'trampoline')
    await director
      .put(`${base}/elements/${double.id}/prerequisites`)
      .send({ prerequisites: [{ elementId: single.id, stepIndex: 3 }] })
      .expect(200)
    const res = await log(coach, athlete.id, { elementId: double.id, kind: 'step', stepIndex: 0 })
    expect(res.status).toBe(201)
    const check = res.body.checks.find((c: { code: string }) => c.code === 'prerequisite')
    expect(check.message).toBe(
      `Prerequisite not met: ${single.name} should be at step 4 or higher (now not started).`,
    )
  })

  it('proposes stepping down 2 steps for a lost skill, with the safety caution, and applies the plan on resume', async () => {
    const athlete = await newAthlete()
    const fullIn = find('backward', 8, [2, 0], 'tuck')
    const at4 = await log(coach, athlete.id, {
      elementId: fullIn.id,
      kind: 'step',
      stepIndex: 4,
      skipReason: 'Transfer from another club',
      occurredOn: '2026-08-01',
    })
    const check = await coach
      .post(`${base}/athletes/${athlete.id}/events/check`)
      .send({
        elementId: fullIn.id,
        kind: 'pause',
        pauseReason: 'lost-skill',
        occurredOn: '2026-11-01',
        expectedLastEventId: at4.body.record.lastEventId,
      })
      .expect(200)
    expect(check.body.plannedStepIndex).toBe(2)
    expect(check.body.checks[0].code).toBe('lost-skill-step-down')
    expect(check.body.checks[0].message).toContain(safetyCaution)
    const paused = await log(
      coach,
      athlete.id,
      { elementId: fullIn.id, kind: 'pause', pauseReason: 'lost-skill', occurredOn: '2026-11-01' },
      at4.body.record,
    )
    expect(paused.body.record).toMatchObject({
      paused: true,
      pauseReason: 'lost-skill',
      plannedStepIndex: 2,
      stepIndex: 4,
    })
    const resumed = await log(
      coach,
      athlete.id,
      { elementId: fullIn.id, kind: 'resume', occurredOn: '2026-11-20' },
      paused.body.record,
    )
    expect(resumed.body.record).toMatchObject({ paused: false, stepIndex: 2, highestStepIndex: 4 })
  })

  it('uses the club’s configured step-down', async () => {
    const athlete = await newAthlete()
    const frontPike = find('forward', 4, [0], 'pike')
    await director.patch(`${base}/settings`).send({ lostSkillStepDown: 1 }).expect(200)
    try {
      const at3 = await log(coach, athlete.id, {
        elementId: frontPike.id,
        kind: 'step',
        stepIndex: 3,
        skipReason: 'Assessed',
        occurredOn: '2026-08-01',
      })
      const paused = await log(
        coach,
        athlete.id,
        { elementId: frontPike.id, kind: 'pause', pauseReason: 'lost-skill' },
        at3.body.record,
      )
      expect(paused.body.record.plannedStepIndex).toBe(2)
    } finally {
      await director.patch(`${base}/settings`).send({ lostSkillStepDown: 2 }).expect(200)
    }
  })

  it('refuses a step past the end of the progression and a date in the future, naming the field', async () => {
    const athlete = await newAthlete()
    const element = find('forward', 4, [0], 'tuck')
    const far = await log(coach, athlete.id, { elementId: element.id, kind: 'step', stepIndex: 99 })
    expect(far.status).toBe(400)
    expect(far.body.error.issues[0].path).toBe('stepIndex')
    const future = await log(coach, athlete.id, {
      elementId: element.id,
      kind: 'step',
      stepIndex: 0,
      occurredOn: '2999-01-01',
    })
    expect(future.body.error.issues[0]).toEqual({
      path: 'occurredOn',
      message: 'The date cannot be in the future.',
    })
  })
})

describe('two coaches on one record', () => {
  it('gives the second writer a 409 with the current state, and loses nothing', async () => {
    const athlete = await newAthlete()
    const element = find('backward', 4, [0], 'straight')
    const start = await log(coach, athlete.id, {
      elementId: element.id,
      kind: 'step',
      stepIndex: 0,
    })
    const seen = start.body.record
    const [a, b] = await Promise.all([
      log(coach, athlete.id, { elementId: element.id, kind: 'step', stepIndex: 1 }, seen),
      log(
        director,
        athlete.id,
        { elementId: element.id, kind: 'pause', pauseReason: 'injury' },
        seen,
      ),
    ])
    const statuses = [a.status, b.status].sort()
    expect(statuses).toEqual([201, 409])
    const loser = a.status === 409 ? a : b
    const winner = a.status === 409 ? b : a
    expect(loser.body.error.code).toBe('conflict')
    expect(loser.body.error.record.lastEventId).toBe(winner.body.record.lastEventId)
    const [events] = await database.db
      .select({ n: count() })
      .from(progressEvents)
      .where(eq(progressEvents.athleteId, athlete.id))
    expect(events!.n).toBe(2)
  })
})

describe('who may see and change progress', () => {
  it('refuses a coach of another squad, lets the clinician only read, refuses the board', async () => {
    const otherSquad = await createSquad(database.db, fx.club.id, {
      name: 'Other squad',
      level: 'senior',
      discipline: 'tumbling',
    })
    const stranger = await newAthlete(otherSquad.id)
    const element = find('forward', 4, [0], 'tuck')
    const refused = await log(coach, stranger.id, {
      elementId: element.id,
      kind: 'step',
      stepIndex: 0,
    })
    expect(refused.status).toBe(403)
    expect(refused.body.error.message).toBe('Other squad is not one of your squads.')
    await coach.get(`${base}/squads/${otherSquad.id}/grid`).expect(403)
    await coach.get(`${base}/athletes/${stranger.id}`).expect(403)
    const mine = (await coach.get(`${base}/athletes`).expect(200)).body as { squadId: string }[]
    expect(mine.every((a) => a.squadId === fx.squad.id)).toBe(true)
    const squads = (await coach.get(`${base}/squads`).expect(200)).body as { id: string }[]
    expect(squads.map((s) => s.id)).toEqual([fx.squad.id])

    // A clinician reads only the squads their visit covers: this one once a visit covers it.
    await clinician.get(`${base}/squads/${fx.squad.id}/grid`).expect(200)
    await clinician.get(`${base}/squads/${otherSquad.id}/grid`).expect(403)
    await scheduleVisit(t.context, fx, [otherSquad.id])
    await clinician.get(`${base}/squads/${otherSquad.id}/grid`).expect(200)
    const write = await log(clinician, stranger.id, {
      elementId: element.id,
      kind: 'step',
      stepIndex: 0,
    })
    expect(write.status).toBe(403)

    await board.get(`${base}/athletes`).expect(403)
    await board.get(`${base}/squads/${fx.squad.id}/grid`).expect(403)
  })

  it('answers 404 for another club’s athlete', async () => {
    const other = await clubWithPeople(database.db, 'progress-other')
    const theirs = await createAthlete(database.db, other.club.id, {
      givenName: 'Far',
      familyName: 'Away',
      birthYear: 2011,
      squadId: other.squad.id,
      discipline: 'artistic-women',
    })
    await director.get(`${base}/athletes/${theirs.id}`).expect(404)
    const res = await log(director, theirs.id, {
      elementId: catalogue[0]!.id,
      kind: 'step',
      stepIndex: 0,
    })
    expect(res.status).toBe(404)
  })
})

describe('athletes', () => {
  it('moves an athlete between squads, keeping the history', async () => {
    const athlete = await newAthlete()
    const element = find('forward', 4, [0], 'straight')
    await log(coach, athlete.id, { elementId: element.id, kind: 'step', stepIndex: 0 })
    const target = await createSquad(database.db, fx.club.id, {
      name: 'Moved to',
      level: 'senior',
      discipline: 'artistic-women',
    })
    const moved = await director
      .patch(`${base}/athletes/${athlete.id}`)
      .send({ squadId: target.id })
      .expect(200)
    expect(moved.body.squadName).toBe('Moved to')
    const records = (await director.get(`${base}/athletes/${athlete.id}/records`).expect(200)).body
    expect(records).toEqual([expect.objectContaining({ elementId: element.id, stepIndex: 0 })])
  })

  it('archives an athlete without losing them', async () => {
    const athlete = await newAthlete()
    await director.patch(`${base}/athletes/${athlete.id}`).send({ archived: true }).expect(200)
    const active = (await director.get(`${base}/athletes`).expect(200)).body as { id: string }[]
    expect(active.some((a) => a.id === athlete.id)).toBe(false)
    const all = (await director.get(`${base}/athletes?includeArchived=true`).expect(200)).body as {
      id: string
      archived: boolean
    }[]
    expect(all.find((a) => a.id === athlete.id)?.archived).toBe(true)
  })

  it('names the field of a bad athlete', async () => {
    const res = await coach.post(`${base}/athletes`).send({
      givenName: 'Ada',
      familyName: '',
      birthYear: 2100,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
    expect(res.status).toBe(400)
    expect(res.body.error.issues.map((i: { path: string }) => i.path).sort()).toEqual([
      'birthYear',
      'familyName',
    ])
  })
})

describe('roster CSV', () => {
  const csv = (lines: string[]) =>
    Papa.parse<Record<string, string>>(
      ['givenName,familyName,birthYear,squad,discipline', ...lines].join('\n'),
      { header: true, skipEmptyLines: true },
    ).data

  it('rolls back the whole file for one bad row, naming the row and the field', async () => {
    const [before] = await database.db.select({ n: count() }).from(athletes)
    const rows = csv([
      'Cora,Elmstead,2013,Squad A,',
      'Dina,Fernleigh,20x3,Squad A,',
      'Elin,Glenwarden,2012,No such squad,',
    ])
    const dry = (
      await director.post(`${base}/athletes/import`).send({ rows, dryRun: true }).expect(200)
    ).body
    expect(dry.valid).toBe(false)
    expect(dry.errors).toEqual([
      { row: 2, field: 'birthYear', message: 'Enter the birth year as a number, e.g. 2014.' },
      { row: 3, field: 'squad', message: 'There is no squad called “No such squad”.' },
    ])
    const real = await director.post(`${base}/athletes/import`).send({ rows, dryRun: false })
    expect(real.status).toBe(422)
    const [after] = await database.db.select({ n: count() }).from(athletes)
    expect(after!.n).toBe(before!.n)
  })

  it('imports a valid file for a coach’s own squad and refuses other squads', async () => {
    const ok = await coach.post(`${base}/athletes/import`).send({
      rows: csv(['Fern,Hollowby,2014,Squad A,', 'Greta,Ivyhurst,2013,Squad A,']),
      dryRun: false,
    })
    expect(ok.status).toBe(201)
    expect(ok.body.created).toBe(2)
    const other = (
      await coach
        .post(`${base}/athletes/import`)
        .send({ rows: csv(['Hana,Kestlow,2014,Other squad,']), dryRun: true })
    ).body
    expect(other.errors[0]).toMatchObject({ row: 1, field: 'squad' })
    const exported = await coach.get(`${base}/athletes/export?squadId=${fx.squad.id}`).expect(200)
    expect(exported.text).toContain('Fern,Hollowby,2014,Squad A,artistic-women')
  })
})

describe('the squad grid and the missing-skills list', () => {
  it('puts each backward element beside its forward mirror and shows the steps reached', async () => {
    const squad = await createSquad(database.db, fx.club.id, {
      name: 'Grid squad',
      level: 'junior',
      discipline: 'artistic-women',
    })
    const athlete = await newAthlete(squad.id)
    const backTuck = find('backward', 4, [0], 'tuck')
    const frontTuck = find('forward', 4, [0], 'tuck')
    await log(director, athlete.id, {
      elementId: backTuck.id,
      kind: 'step',
      stepIndex: 4,
      skipReason: 'Assessed',
    })
    const grid = (
      await director
        .get(`${base}/squads/${squad.id}/grid?apparatus=floor&rotationClass=single`)
        .expect(200)
    ).body as Grid
    expect(grid.columns.every((c) => c.apparatus === 'floor' && c.rotationClass === 'single')).toBe(
      true,
    )
    const i = grid.columns.findIndex((c) => c.elementId === backTuck.id)
    expect(grid.columns[i + 1]!.elementId).toBe(frontTuck.id)
    expect(grid.columns[i + 1]!.pairKey).toBe(grid.columns[i]!.pairKey)
    // FIG trampoline numeric notation (Code of Points, trampoline): 4 quarter saltos, no twist,
    // tucked. The step count is the element's progression as its own page lists it.
    expect(grid.columns[i]!.notation).toBe('40o')
    const detail = (await director.get(`${base}/elements/${backTuck.id}`).expect(200)).body as {
      steps: unknown[]
    }
    expect(grid.columns[i]!.stepCount).toBe(detail.steps.length)
    expect(detail.steps.length).toBeGreaterThan(4)
    expect(grid.athletes.map((a) => a.id)).toEqual([athlete.id])
    expect(grid.cells[0]![i]).toEqual({ step: 4, paused: false, flagged: true })
    expect(grid.cells[0]![i + 1]!.step).toBeNull()

    const missing = (await director.get(`${base}/missing-skills?squadId=${squad.id}`).expect(200))
      .body
    expect(missing).toEqual([
      expect.objectContaining({
        athleteId: athlete.id,
        backward: expect.objectContaining({ elementId: backTuck.id, stepIndex: 4 }),
        forward: expect.objectContaining({ elementId: frontTuck.id, stepIndex: null }),
      }),
    ])
    // The standard catalogue has a back tuck on floor and on tumbling: the list says which.
    expect([missing[0].backward.name, missing[0].forward.name]).toEqual([
      `${backTuck.name} (floor)`,
      `${frontTuck.name} (floor)`,
    ])
    expect(catalogue.filter((e) => e.name === backTuck.name).map((e) => e.apparatus)).toEqual(
      expect.arrayContaining(['floor', 'tumbling']),
    )
    // two steps behind counts, one does not
    const r1 = await log(director, athlete.id, {
      elementId: frontTuck.id,
      kind: 'step',
      stepIndex: 2,
      skipReason: 'Assessed',
    })
    expect((await director.get(`${base}/missing-skills?squadId=${squad.id}`)).body[0].trailBy).toBe(
      2,
    )
    await log(
      director,
      athlete.id,
      { elementId: frontTuck.id, kind: 'step', stepIndex: 3 },
      r1.body.record,
    )
    expect((await director.get(`${base}/missing-skills?squadId=${squad.id}`)).body).toEqual([])
  })

  it('reads records through the mapping when the steps change', async () => {
    const athlete = await newAthlete()
    const element = find('backward', 8, [0, 0], 'pike')
    await log(director, athlete.id, {
      elementId: element.id,
      kind: 'step',
      stepIndex: 3,
      skipReason: 'Assessed',
    })
    const detail = (await director.get(`${base}/elements/${element.id}`).expect(200)).body
    const steps = [
      { name: 'Soft equipment', modality: 'pit', criterion: 'Five in a row into the pit.' },
      { name: 'Floor', modality: 'floor-solo', criterion: 'Five in a row on the floor.' },
      { name: 'Routine', modality: 'routine', criterion: 'Twice in a routine.' },
    ]
    const mapping = detail.steps.map((_: unknown, i: number) => Math.min(2, Math.floor(i / 3)))
    await director
      .put(`${base}/elements/${element.id}/steps`)
      .send({ steps, mapping, stepsVersion: detail.stepsVersion })
      .expect(200)
    const record = (
      await director.get(`${base}/athletes/${athlete.id}/records/${element.id}`).expect(200)
    ).body
    expect(record.stepIndex).toBe(mapping[3])
    expect(record.steps.map((s: { name: string }) => s.name)).toEqual([
      'Soft equipment',
      'Floor',
      'Routine',
    ])
  })
})
