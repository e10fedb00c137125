import { and, eq, sql } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { replayRecord } from '../../shared/domain/progress.ts'
import { progressEvents, progressRecords } from '../../server/db/schema-athletes.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { getElement } from '../../server/services/catalogue.ts'
import { replaceSteps } from '../../server/services/catalogue-steps.ts'
import { elementContext, toDomainEvent } from '../../server/services/progress-records.ts'
import { saveBatch } from '../../server/services/progress-batch.ts'
import { batchInputSchema } from '../../shared/schemas/progress-batch.ts'
import {
  closeBatchClub,
  eventCount,
  newBatchSquad,
  openBatchClub,
  type BatchClub,
} from '../support/batch-club.ts'
import { clubWithPeople } from '../support/fixtures.ts'

// A squad batch against a steps change made at the same moment, and the batch's input checks.
// The rules are the product brief's (common practice, no published source); the worked examples
// beside each case are hand-worked from the standard catalogue's back tuck progression.

let club: BatchClub
let database: BatchClub['database']
let fx: BatchClub['fx']
let coach: BatchClub['coach']
let base: BatchClub['base']
let tucks: BatchClub['tucks']

beforeAll(async () => {
  club = await openBatchClub('batchrace')
  ;({ database, fx, coach, base, tucks } = club)
})
afterAll(() => closeBatchClub(club))

const newSquad = (size: number) => newBatchSquad(club, size, { familyName: 'Vale' })
const eventsOf = (athleteIds: string[]) => eventCount(club, athleteIds)

const batch = (squadId: string) => `${base}/squads/${squadId}/progress-batch`
const single = (athleteId: string) => `${base}/athletes/${athleteId}/events`
const firstStep = {
  kind: 'step',
  stepIndex: 0,
  occurredOn: '2026-11-01',
  expectedLastEventId: null,
}
const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

/**
 * A steps change (a new first step in front of the old ones: old step i becomes new step i + 1)
 * applied in a transaction that keeps the element's lock until `release` is called.
 */
async function holdStepsChange(elementId: string) {
  const before = await getElement(database.db, fx.club.id, elementId)
  const update = {
    stepsVersion: before.stepsVersion,
    steps: [
      { name: 'Shape drills', modality: 'floor-drill', criterion: 'Tuck held 5 s.' },
      ...before.steps.map((s) => ({
        name: s.name,
        modality: s.modality,
        criterion: s.criterion,
        ...(s.minDays === null ? {} : { minDays: s.minDays }),
      })),
    ],
    mapping: before.steps.map((_, i) => i + 1),
  }
  let release!: () => void
  const gate = new Promise<void>((resolve) => (release = resolve))
  let changed!: () => void
  const applied = new Promise<void>((resolve) => (changed = resolve))
  const access = { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' as const }
  const stepsChange = database.db.transaction(async (tx) => {
    await replaceSteps(tx, access, elementId, update as Parameters<typeof replaceSteps>[3])
    changed()
    await gate
  })
  await applied
  return { before, release, stepsChange }
}

/** The stored record of one athlete on one element, and the replay of its events now. */
async function storedAndReplayed(athleteId: string, elementId: string) {
  const element = await elementContext(database.db, fx.club.id, elementId)
  const rows = await database.db
    .select()
    .from(progressEvents)
    .where(
      and(
        eq(progressEvents.clubId, fx.club.id),
        eq(progressEvents.athleteId, athleteId),
        eq(progressEvents.elementId, elementId),
      ),
    )
  const [stored] = await database.db
    .select()
    .from(progressRecords)
    .where(
      and(
        eq(progressRecords.clubId, fx.club.id),
        eq(progressRecords.athleteId, athleteId),
        eq(progressRecords.elementId, elementId),
      ),
    )
  return { stored: stored!, replayed: replayRecord(rows.map((r) => toDomainEvent(r, element))) }
}

describe('a squad batch racing a steps change', () => {
  it('waits for the change and records the step in the new steps, as a replay reads it', async () => {
    const { squad, athletes } = await newSquad(1)
    const athleteId = athletes[0]!.id
    const elementId = tucks.frontTuck
    const started = await coach
      .post(single(athleteId))
      .send({ ...firstStep, elementId })
      .expect(201)
    const { before, release, stepsChange } = await holdStepsChange(elementId)
    const saving = coach
      .post(batch(squad.id))
      .send({
        elementId,
        occurredOn: '2026-11-20',
        entries: [
          { athleteId, elementId, expectedLastEventId: started.body.eventId, skipReason: null },
        ],
      })
      .then((res) => res)
    await pause(400)
    release()
    await stepsChange
    const res = await saving
    expect(res.status).toBe(201)
    // Step 1 (old numbering) is step 2 after the change (new numbering, 0-based 1); passing the
    // next step records new index 2, under the new steps version.
    const [event] = await database.db
      .select()
      .from(progressEvents)
      .where(
        and(
          eq(progressEvents.clubId, fx.club.id),
          eq(progressEvents.id, res.body.results[0].eventId),
        ),
      )
    expect(event!.stepsVersion).toBe(before.stepsVersion + 1)
    expect(event!.stepIndex).toBe(2)
    const { stored, replayed } = await storedAndReplayed(athleteId, elementId)
    expect(stored.stepIndex).toBe(replayed.stepIndex)
    expect(replayed.stepIndex).toBe(2)
  })

  it('a single entry for an athlete new to the element waits for the change too', async () => {
    const { athletes } = await newSquad(2)
    const [onIt, newcomer] = athletes.map((a) => a.id)
    const elementId = tucks.backTuck
    // Someone on the element already, so the change keeps a mapping of the old steps.
    await coach
      .post(single(onIt!))
      .send({ ...firstStep, elementId })
      .expect(201)
    const { release, stepsChange } = await holdStepsChange(elementId)
    const saving = coach
      .post(single(newcomer!))
      .send({ ...firstStep, elementId, occurredOn: '2026-11-20' })
      .then((res) => res)
    await pause(400)
    release()
    await stepsChange
    expect((await saving).status).toBe(201)
    // The first step named after the change is the new first step (hand-worked): the stored
    // record and a replay of the events agree on it.
    const { stored, replayed } = await storedAndReplayed(newcomer!, elementId)
    expect(replayed.stepIndex).toBe(0)
    expect(stored.stepIndex).toBe(replayed.stepIndex)
  })

  it('two batches naming the same athletes in opposite orders: one saves, one is told the record moved', async () => {
    const { squad, athletes } = await newSquad(4)
    const entries = athletes.flatMap((a) =>
      [tucks.backTuck, tucks.frontTuck].map((elementId) => ({
        athleteId: a.id,
        elementId,
        expectedLastEventId: null,
      })),
    )
    const body = (list: typeof entries) => ({
      elementId: tucks.backTuck,
      counterpartId: tucks.frontTuck,
      occurredOn: '2026-11-02',
      entries: list,
    })
    const answers = await Promise.all([
      coach.post(batch(squad.id)).send(body(entries)),
      coach.post(batch(squad.id)).send(body([...entries].reverse())),
    ])
    expect(answers.map((r) => r.status).sort()).toEqual([201, 409])
    const refused = answers.find((r) => r.status === 409)!
    // A stale record, named by its entry: not a deadlock broken by the database.
    expect(refused.body.error.issues[0].path).toMatch(/^entries\.\d+\.expectedLastEventId$/)
    expect(await eventsOf(athletes.map((a) => a.id))).toBe(8)
  })
})

describe('a squad batch’s input', () => {
  const entryFor = (athleteId: string, extra: Record<string, unknown> = {}) => ({
    athleteId,
    elementId: tucks.backTuck,
    expectedLastEventId: null,
    ...extra,
  })
  const send = (squadId: string, entries: unknown[]) =>
    coach
      .post(batch(squadId))
      .send({ elementId: tucks.backTuck, occurredOn: '2026-11-02', entries })

  it('needs expectedLastEventId on every entry, so that a repeat cannot move an athlete twice', async () => {
    const { squad, athletes } = await newSquad(1)
    const res = await send(squad.id, [{ athleteId: athletes[0]!.id, elementId: tucks.backTuck }])
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('entries.0.expectedLastEventId')
    expect(await eventsOf([athletes[0]!.id])).toBe(0)
  })

  it('refuses the same clientEventId twice in one batch, naming the second', async () => {
    const { squad, athletes } = await newSquad(2)
    const id = crypto.randomUUID()
    const res = await send(
      squad.id,
      athletes.map((a) => entryFor(a.id, { clientEventId: id })),
    )
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('entries.1.clientEventId')
    expect(await eventsOf(athletes.map((a) => a.id))).toBe(0)
  })

  it('names the stale entry in the 409’s issues', async () => {
    const { squad, athletes } = await newSquad(2)
    await coach
      .post(single(athletes[1]!.id))
      .send({ ...firstStep, elementId: tucks.backTuck })
      .expect(201)
    const res = await send(
      squad.id,
      athletes.map((a) => entryFor(a.id)),
    )
    expect(res.status).toBe(409)
    expect(res.body.error.issues).toEqual([
      { path: 'entries.1.expectedLastEventId', message: expect.any(String) },
    ])
  })

  it('refuses a step past the progression’s last, naming the field and the step count', async () => {
    const { squad, athletes } = await newSquad(1)
    const element = await getElement(database.db, fx.club.id, tucks.backTuck)
    const res = await send(squad.id, [
      entryFor(athletes[0]!.id, { stepIndex: element.steps.length, skipReason: 'Assessed' }),
    ])
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('entries.0.stepIndex')
    expect(res.body.error.message).toContain(`has ${element.steps.length} steps`)
  })

  it('refuses another club’s athlete as not in the squad', async () => {
    const { squad } = await newSquad(1)
    const other = await clubWithPeople(database.db, 'batchother')
    const stranger = await createAthlete(database.db, other.club.id, {
      givenName: 'Ida',
      familyName: 'Moss',
      birthYear: 2012,
      squadId: other.squad.id,
      discipline: 'artistic-women',
    })
    const res = await send(squad.id, [entryFor(stranger.id)])
    expect(res.status).toBe(400)
    expect(res.body.error.issues[0].path).toBe('entries.0.athleteId')
    expect(await eventsOf([stranger.id])).toBe(0)
  })

  it('answers a replay with a changed body with 409 naming the entry’s id', async () => {
    const { squad, athletes } = await newSquad(1)
    const clientEventId = crypto.randomUUID()
    await send(squad.id, [entryFor(athletes[0]!.id, { clientEventId })]).expect(201)
    const changed = await coach.post(batch(squad.id)).send({
      elementId: tucks.backTuck,
      occurredOn: '2026-11-03',
      entries: [entryFor(athletes[0]!.id, { clientEventId })],
    })
    expect(changed.status).toBe(409)
    expect(changed.body.error.code).toBe('client_event_reused')
    expect(changed.body.error.issues[0].path).toBe('entries.0.clientEventId')
    expect(await eventsOf([athletes[0]!.id])).toBe(1)
  })

  it('stamps its events with the database’s time, as a single entry’s', async () => {
    const { squad, athletes } = await newSquad(1)
    const access = { clubId: fx.club.id, userId: fx.people.coach.id, role: 'coach' as const }
    const input = batchInputSchema.parse({
      elementId: tucks.backTuck,
      occurredOn: '2026-11-02',
      entries: [entryFor(athletes[0]!.id)],
    })
    // In one transaction the database's now() is its start: later than it, the server's clock.
    const { started, recordedAt } = await database.db.transaction(async (tx) => {
      const [row] = await tx
        .select({ ms: sql<string>`floor(extract(epoch from now()) * 1000)::bigint` })
        .from(sql`(select 1) as one`)
      await pause(50)
      const result = await saveBatch(tx, access, squad.id, input)
      const [event] = await tx
        .select({ recordedAt: progressEvents.recordedAt })
        .from(progressEvents)
        .where(
          and(
            eq(progressEvents.clubId, fx.club.id),
            eq(progressEvents.id, result.results[0]!.eventId),
          ),
        )
      return { started: Number(row!.ms), recordedAt: event!.recordedAt }
    })
    expect(Math.abs(recordedAt.getTime() - started)).toBeLessThanOrEqual(1)
  })

  it('keeps a client id unique only where one is given (a partial index)', async () => {
    const rows = await database.db.execute<{ indexdef: string }>(
      sql`select indexdef from pg_indexes where indexname = 'progress_events_client_event_idx'`,
    )
    const def =
      (rows as unknown as { rows?: { indexdef: string }[] }).rows?.[0]?.indexdef ??
      (rows as unknown as { indexdef: string }[])[0]?.indexdef
    expect(def).toMatch(/WHERE \(client_event_id IS NOT NULL\)/)
  })
})
