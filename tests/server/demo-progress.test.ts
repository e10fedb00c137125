import { and, count, eq } from 'drizzle-orm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { clubs, users } from '../../server/db/schema-accounts.ts'
import {
  athletes,
  progressEvents,
  progressRecords,
  squads,
} from '../../server/db/schema-athletes.ts'
import { audits } from '../../server/db/schema-audits.ts'
import { elements, elementSteps } from '../../server/db/schema-catalogue.ts'
import { prepareDatabase } from '../../server/cli/bootstrap.ts'
import { boardSummary, getReport, runAndStore } from '../../server/services/audits.ts'
import { listElements } from '../../server/services/catalogue.ts'
import { womensArtisticFloorProfile } from '../../shared/domain/audit/readiness.ts'
import { freshDatabase } from '../support/database.ts'

// The demo's made-up history must show what the product is for: one squad whose forward program
// trails, one balanced, paused records and flagged skips.

let database: Database & { url: string }
beforeAll(async () => {
  database = await freshDatabase()
  await prepareDatabase(database.url, { today: new Date('2026-12-01T12:00:00Z') })
})
afterAll(() => database.close())

async function balanceBySquad() {
  const rows = await database.db
    .select({
      squad: squads.name,
      direction: elements.direction,
      stepIndex: progressRecords.stepIndex,
      elementId: elements.id,
    })
    .from(progressRecords)
    .innerJoin(
      athletes,
      and(eq(athletes.clubId, progressRecords.clubId), eq(athletes.id, progressRecords.athleteId)),
    )
    .innerJoin(squads, and(eq(squads.clubId, athletes.clubId), eq(squads.id, athletes.squadId)))
    .innerJoin(
      elements,
      and(eq(elements.clubId, progressRecords.clubId), eq(elements.id, progressRecords.elementId)),
    )
  const counts = new Map(
    (
      await database.db
        .select({ id: elementSteps.elementId, n: count() })
        .from(elementSteps)
        .groupBy(elementSteps.elementId)
    ).map((c) => [c.id, c.n]),
  )
  const sums = new Map<string, { forward: number; backward: number }>()
  for (const r of rows) {
    const s = sums.get(r.squad) ?? { forward: 0, backward: 0 }
    const p = r.stepIndex === null ? 0 : (r.stepIndex + 1) / counts.get(r.elementId)!
    if (r.direction === 'forward') s.forward += p
    if (r.direction === 'backward') s.backward += p
    sums.set(r.squad, s)
  }
  return new Map([...sums].map(([squad, s]) => [squad, s.forward / s.backward]))
}

describe('the demo club’s history', () => {
  it('spans about 18 months', async () => {
    const events = await database.db.select({ on: progressEvents.occurredOn }).from(progressEvents)
    expect(events.length).toBeGreaterThan(1000)
    const dates = events.map((e) => e.on).sort()
    expect(dates[0]! < '2025-08-01').toBe(true)
    expect(dates.at(-1)! <= '2026-12-01').toBe(true)
  })

  it('has one squad whose forward program clearly trails and one that is balanced', async () => {
    const ratio = await balanceBySquad()
    expect(ratio.get('Falcons')!).toBeLessThan(0.5)
    expect(ratio.get('Kites')!).toBeGreaterThan(0.85)
  })

  it('has paused records for a lost skill and an injury, and flagged skips', async () => {
    const paused = await database.db
      .select()
      .from(progressRecords)
      .where(eq(progressRecords.paused, true))
    expect(paused.map((p) => p.pauseReason).sort()).toEqual(
      expect.arrayContaining(['injury', 'lost-skill']),
    )
    const lost = paused.find((p) => p.pauseReason === 'lost-skill')!
    expect(lost.plannedStepIndex).toBe(lost.stepIndex! - 2)
    const flagged = await database.db
      .select({ n: count() })
      .from(progressEvents)
      .where(eq(progressEvents.flagged, true))
    expect(flagged[0]!.n).toBeGreaterThan(0)
  })

  it('has a year of published quarterly audits for the board to read', async () => {
    const rows = await database.db
      .select({ asOf: audits.asOf, squadId: audits.squadId, publishedAt: audits.publishedAt })
      .from(audits)
    // seeded on 1 December 2026: the ends of the four quarters before the current one
    expect(rows.map((r) => r.asOf).sort()).toEqual([
      '2025-12-31',
      '2026-03-31',
      '2026-06-30',
      '2026-09-30',
    ])
    expect(rows.every((r) => r.squadId === null && r.publishedAt !== null)).toBe(true)
    const [club] = await database.db.select().from(clubs)
    const board = await boardSummary(database.db, club!.id)
    expect(board.trend.map((p) => p.asOf)).toEqual([
      '2025-12-31',
      '2026-03-31',
      '2026-06-30',
      '2026-09-30',
    ])
    const falcons = board.latest!.squads.find((s) => s.name === 'Falcons')!
    const kites = board.latest!.squads.find((s) => s.name === 'Kites')!
    expect(falcons.frontLag).toBeGreaterThan(kites.frontLag)
  })

  it('checks its floor gymnasts’ readiness on floor elements only', async () => {
    // The demo's artistic squads also train on the trampoline. The women's floor profile (FIG WAG
    // Code of Points 2022–2024, floor composition requirements, from memory) is met on floor
    // alone, so a trampoline double or twist never makes a gymnast ready for floor.
    const [club] = await database.db.select().from(clubs)
    const [director] = await database.db
      .select()
      .from(users)
      .where(eq(users.email, 'director@demo.example'))
    const access = { clubId: club!.id, userId: director!.id, role: 'director' as const }
    const id = await runAndStore(database.db, access, { squadId: null, asOf: '2026-12-01' })
    const { result } = await getReport(database.db, access, id)
    const catalogue = new Map((await listElements(database.db, club!.id)).map((e) => [e.id, e]))
    const floorRows = result.readiness.filter((r) => r.profileId === womensArtisticFloorProfile.id)
    expect(floorRows.length).toBeGreaterThan(0)
    const suggested = floorRows.flatMap((r) => r.requirements.map((s) => s.elementId))
    expect(new Set(suggested.map((e) => catalogue.get(e!)!.apparatus))).toEqual(new Set(['floor']))
    // Someone on the trampoline as far as a double or a full twist is still missing those on floor.
    const records = await database.db.select().from(progressRecords)
    const trampolineReady = floorRows.filter((row) =>
      records.some((r) => {
        const e = catalogue.get(r.elementId)!
        return (
          r.athleteId === row.athleteId &&
          e.apparatus === 'trampoline' &&
          (e.rotationClass === 'double' || e.twistBand === 'full') &&
          r.stepIndex !== null &&
          r.stepIndex >= 2
        )
      }),
    )
    expect(trampolineReady.length).toBeGreaterThan(0)
    // One of them has met nothing on floor yet: all four requirements are missing (her
    // trampoline double back with a full twist made three of them read as met before).
    expect(trampolineReady.some((row) => row.missingCount === 4)).toBe(true)
  })
})
