import { and, eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { athletes, progressRecords } from '../../server/db/schema-athletes.ts'
import { elementSteps } from '../../server/db/schema-catalogue.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { gatherInputs } from '../../server/services/audit-inputs.ts'
import { listElements, stepsOf } from '../../server/services/catalogue.ts'
import { createElement } from '../../server/services/catalogue-writes.ts'
import { recordEvent } from '../../server/services/progress-events.ts'
import { appendHistory, type HistoryEvent } from '../../server/services/progress-history.ts'
import { recordDetail } from '../../server/services/progress-reads.ts'
import { backfillRecordTimelines } from '../../server/services/progress-records.ts'
import { auditInputHash } from '../../shared/domain/audit/hashing.ts'
import { createSquad } from '../../server/services/squads.ts'
import { freshDatabase } from '../support/database.ts'
import { clubWithPeople, floorTucks } from '../support/fixtures.ts'

// What the audit reads as of a date: each record's steps by then and the athlete's recent pace
// (steps per 30 days over the last 180 days). Definitions from the product brief: common practice
// (no published source). Every figure below is worked out by hand from the events listed.

let database: Database
let fx: Awaited<ReturnType<typeof clubWithPeople>>
let backTuck: string
let frontTuck: string

beforeAll(async () => {
  database = await freshDatabase()
  fx = await clubWithPeople(database.db, 'inputs')
  ;({ backTuck, frontTuck } = await floorTucks(database.db, fx.club.id))
})
afterAll(async () => {
  await database.close()
})

async function newAthlete(familyName: string) {
  return (
    await createAthlete(database.db, fx.club.id, {
      givenName: 'Test',
      familyName,
      birthYear: 2012,
      squadId: fx.squad.id,
      discipline: 'artistic-women',
    })
  ).id
}

const step = (
  athleteId: string,
  elementId: string,
  stepIndex: number,
  occurredOn: string,
): HistoryEvent => ({
  athleteId,
  elementId,
  coachId: fx.people.coach.id,
  change: { kind: 'step', stepIndex, occurredOn, skipReason: 'Assessed' },
})

const access = () => ({
  clubId: fx.club.id,
  userId: fx.people.director.id,
  role: 'director' as const,
})

async function inputsFor(athleteId: string, asOf: string) {
  const inputs = await gatherInputs(database.db, fx.club.id, fx.squad.id, asOf)
  return {
    steps: Object.fromEntries(
      inputs.records
        .filter((r) => r.athleteId === athleteId)
        .map((r) => [r.elementId, r.stepIndex]),
    ),
    pace: inputs.paces?.[athleteId] ?? 0,
  }
}

describe('the audit’s inputs as of a date', () => {
  it('reads each element as the catalogue shows it, with the length of its progression', async () => {
    // Another club with the same standard catalogue: none of its elements, counterparts or
    // steps may enter this club's inputs.
    await clubWithPeople(database.db, 'inputs-other')
    // One element whose progression was never stored (a new element gets its template's steps,
    // so the rows are removed here): it counts as one step.
    const bare = await createElement(database.db, access(), {
      name: 'Back salto piked with full twist (no steps yet)',
      apparatus: 'trampoline',
      direction: 'backward',
      quarterRotations: 4,
      twists: [2],
      shape: 'pike',
      takeOff: 'standing',
    })
    await database.db
      .delete(elementSteps)
      .where(and(eq(elementSteps.clubId, fx.club.id), eq(elementSteps.elementId, bare.id)))
    const inputs = await gatherInputs(database.db, fx.club.id, fx.squad.id, '2026-06-30')
    const catalogue = await listElements(database.db, fx.club.id)
    const expected = await Promise.all(
      catalogue.map(async (e) => ({
        id: e.id,
        name: e.name,
        apparatus: e.apparatus,
        direction: e.direction,
        rotationClass: e.rotationClass,
        twistBand: e.twistBand,
        counterpartId: e.counterpartId,
        stepCount: Math.max(1, (await stepsOf(database.db, fx.club.id, e.id)).length),
      })),
    )
    const byId = (a: { id: string }, b: { id: string }) => (a.id < b.id ? -1 : 1)
    expect([...inputs.elements].sort(byId)).toEqual(expected.sort(byId))
    // A back salto tucked is one rotation (FIG numeric notation: 4 quarter rotations) with no
    // twist, and its counterpart is the front salto tucked.
    const back = inputs.elements.find((e) => e.id === backTuck)!
    expect(back).toMatchObject({ rotationClass: 'single', twistBand: 'none' })
    expect(back.counterpartId).toBe(frontTuck)
    expect(inputs.elements.find((e) => e.id === bare.id)).toMatchObject({
      stepCount: 1,
      rotationClass: 'single',
      twistBand: 'full',
    })
  })

  it('takes each record’s highest step by the date and the pace over the 180 days before it', async () => {
    const athlete = await newAthlete('Asof')
    await appendHistory(database.db, fx.club.id, [
      step(athlete, backTuck, 0, '2026-01-10'),
      step(athlete, backTuck, 2, '2026-03-10'),
      step(athlete, backTuck, 3, '2026-08-01'),
      step(athlete, frontTuck, 1, '2026-05-01'),
    ])
    // As of 30 June: back tuck at 2, front tuck at 1. The window starts on 1 January (180 days
    // before): back tuck −1 → 2 is 3 steps, front tuck −1 → 1 is 2 steps; 5 / 180 × 30 = 5/6.
    const june = await inputsFor(athlete, '2026-06-30')
    expect(june.steps).toEqual({ [backTuck]: 2, [frontTuck]: 1 })
    expect(june.pace).toBeCloseTo(5 / 6, 12)
    // Before anything happened the athlete has no record in the audit at all.
    expect(await inputsFor(athlete, '2025-12-31')).toEqual({ steps: {}, pace: 0 })
  })

  it('carries on an existing record when a history is appended to it', async () => {
    const athlete = await newAthlete('Appended')
    await appendHistory(database.db, fx.club.id, [step(athlete, backTuck, 1, '2026-02-01')])
    await appendHistory(database.db, fx.club.id, [step(athlete, backTuck, 2, '2026-04-01')])
    expect((await inputsFor(athlete, '2026-06-30')).steps).toEqual({ [backTuck]: 2 })
    const detail = await recordDetail(database.db, access(), athlete, backTuck)
    expect(detail.events.map((e) => e.stepIndex).sort()).toEqual([1, 2])
    expect(detail.stepIndex).toBe(2)
  })

  it('leaves out a mistaken event even when its correction is dated after the audit', async () => {
    const athlete = await newAthlete('Corrected')
    await appendHistory(database.db, fx.club.id, [
      step(athlete, backTuck, 0, '2026-02-01'),
      step(athlete, backTuck, 4, '2026-03-01'),
    ])
    const before = await recordDetail(database.db, access(), athlete, backTuck)
    const mistaken = before.events.find((e) => e.stepIndex === 4)!
    await recordEvent(database.db, access(), athlete, {
      elementId: backTuck,
      kind: 'step',
      stepIndex: 1,
      occurredOn: '2026-09-01',
      correctsEventId: mistaken.id,
      expectedLastEventId: before.lastEventId,
      note: 'Logged on the wrong element',
    })
    // The step 4 of 1 March was never true: as of 30 June the athlete had step 0 only.
    expect((await inputsFor(athlete, '2026-06-30')).steps).toEqual({ [backTuck]: 0 })
    expect((await inputsFor(athlete, '2026-09-30')).steps).toEqual({ [backTuck]: 1 })
  })

  it('replays a record stored before timelines were kept, and the start-up backfill fills it in', async () => {
    const athlete = await newAthlete('Legacy')
    await appendHistory(database.db, fx.club.id, [
      step(athlete, frontTuck, 0, '2026-01-05'),
      step(athlete, frontTuck, 3, '2026-05-05'),
    ])
    const expected = await inputsFor(athlete, '2026-06-30')
    const key = and(
      eq(progressRecords.clubId, fx.club.id),
      eq(progressRecords.athleteId, athlete),
      eq(progressRecords.elementId, frontTuck),
    )
    await database.db.update(progressRecords).set({ timeline: null }).where(key)
    expect(await inputsFor(athlete, '2026-06-30')).toEqual(expected)

    expect(await backfillRecordTimelines(database.db)).toBe(1)
    const [row] = await database.db.select().from(progressRecords).where(key)
    // [day, step, highest step]
    expect(row!.timeline).toEqual([
      ['2026-01-05', 0, 0],
      ['2026-05-05', 3, 3],
    ])
    expect(await backfillRecordTimelines(database.db)).toBe(0)
  })

  it('reads every athlete of a squad larger than one read, each once, and none archived', async () => {
    const squad = await createSquad(database.db, fx.club.id, {
      name: 'Large squad',
      level: 'junior',
      discipline: 'artistic-women',
    })
    // 205 athletes, one in four with a second record, read 50 records at a time: six reads,
    // one after another. Athlete i reached step i mod 3 on the back tuck on 10 January, and
    // nothing before; one in four also reached the front tuck's first step that day.
    const twoRecords = (i: number) => i % 4 === 0
    const ids: string[] = []
    const history: HistoryEvent[] = []
    for (let i = 0; i < 205; i++) {
      const { id } = await createAthlete(database.db, fx.club.id, {
        givenName: 'Large',
        familyName: `Athlete ${i}`,
        birthYear: 2012,
        squadId: squad.id,
        discipline: 'artistic-women',
      })
      ids.push(id)
      history.push(step(id, backTuck, i % 3, '2026-01-10'))
      if (twoRecords(i)) history.push(step(id, frontTuck, 0, '2026-01-10'))
    }
    await appendHistory(database.db, fx.club.id, history)
    const archived = ids[150]!
    await database.db
      .update(athletes)
      .set({ archivedAt: new Date() })
      .where(and(eq(athletes.clubId, fx.club.id), eq(athletes.id, archived)))

    const reading = { recordsPerRead: 50 }
    const inputs = await gatherInputs(database.db, fx.club.id, squad.id, '2026-06-30', reading)
    const expected = ids.flatMap((id, i) =>
      id === archived
        ? []
        : [
            { athleteId: id, elementId: backTuck, stepIndex: i % 3 },
            ...(twoRecords(i) ? [{ athleteId: id, elementId: frontTuck, stepIndex: 0 }] : []),
          ],
    )
    const key = (r: { athleteId: string; elementId: string }) => `${r.athleteId} ${r.elementId}`
    const byAthlete = (a: { athleteId: string; elementId: string }, b: typeof a) =>
      key(a) < key(b) ? -1 : 1
    expect(inputs.athletes.map((a) => a.id).sort()).toEqual(
      ids.filter((id) => id !== archived).sort(),
    )
    expect([...inputs.records].sort(byAthlete)).toEqual(expected.sort(byAthlete))
    // The window opens on 1 January: from below the first step (−1) to step s is s + 1 steps in
    // 180 days, (s + 1) / 180 × 30 = (s + 1) / 6 steps per 30 days; the front tuck adds 1 / 6.
    ids.forEach((id, i) => {
      if (id === archived) expect(inputs.paces?.[id]).toBeUndefined()
      else expect(inputs.paces?.[id]).toBeCloseTo(((i % 3) + 1 + (twoRecords(i) ? 1 : 0)) / 6, 12)
    })
    // The same inside a transaction, whose one connection runs one query at a time, one record
    // per read: every athlete with two records is read in two.
    const inTransaction = await database.db.transaction((tx) =>
      gatherInputs(tx, fx.club.id, squad.id, '2026-06-30', { recordsPerRead: 1 }),
    )
    // And with the default reads (one of them), the same records.
    const inTwo = await gatherInputs(database.db, fx.club.id, squad.id, '2026-06-30')
    expect([...inTwo.records].sort(byAthlete)).toEqual(expected)
    expect([...inTransaction.records].sort(byAthlete)).toEqual(expected)
    expect(inTransaction.paces).toEqual(inputs.paces)
    // The input hash does not depend on the order the reads brought the records in.
    const reordered = { ...inputs, records: [...inputs.records].reverse() }
    expect(await auditInputHash(inputs)).toBe(await auditInputHash(reordered))
    // A read of no records would never end: refused before any read.
    for (const recordsPerRead of [0, -1, 2.5, Number.NaN]) {
      await expect(
        gatherInputs(database.db, fx.club.id, squad.id, '2026-06-30', { recordsPerRead }),
      ).rejects.toThrow(/recordsPerRead/)
    }
  }, 60_000)
})
