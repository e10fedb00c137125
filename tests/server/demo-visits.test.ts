import { and, eq } from 'drizzle-orm'
import { afterAll, beforeAll, expect, it } from 'vitest'
import { seedDemo } from '../../seed/demo.ts'
import type { Database } from '../../server/db/client.ts'
import { audits } from '../../server/db/schema-audits.ts'
import { clips, recommendations, visits } from '../../server/db/schema-visits.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'

let database: Database
let t: TestApp
let clubId: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database, { worker: false })
  const seeded = await seedDemo(database.db, {
    today: new Date('2025-03-10T12:00:00Z'),
    clips: t.context.clips,
  })
  clubId = seeded.club.id
}, 120_000)
afterAll(async () => {
  await t.close()
  await database.close()
})

it('seeds one visit open around the day of seeding, covering one squad, with recommendations in three states', async () => {
  const [visit] = await database.db
    .select()
    .from(visits)
    .where(and(eq(visits.clubId, clubId), eq(visits.lastDay, '2025-03-31')))
  // Seeded as of 10 March 2025: a week before is 3 March, three weeks after is 31 March.
  expect(visit).toMatchObject({ firstDay: '2025-03-03', lastDay: '2025-03-31' })
  const recs = await database.db
    .select()
    .from(recommendations)
    .where(and(eq(recommendations.clubId, clubId), eq(recommendations.visitId, visit!.id)))
  expect(recs.map((r) => r.status).sort()).toEqual(['accepted', 'declined', 'open'])
  expect(recs.find((r) => r.status === 'open')!.suggestedStepIndex).toBe(1)
})

it('seeds three short WebM clips of the visited squad, stored and playable by range', async () => {
  const rows = await database.db.select().from(clips).where(eq(clips.clubId, clubId))
  expect(rows).toHaveLength(3)
  for (const row of rows) {
    expect(row.contentType).toBe('video/webm')
    // A few kilobytes each, as recorded (seed/clips).
    expect(row.sizeBytes).toBeGreaterThan(1000)
    expect(row.sizeBytes).toBeLessThan(20_000)
    const head = t.context.clips!.get(row.objectKey, 0, 3)
    const bytes: Buffer[] = []
    for await (const chunk of await head) bytes.push(chunk as Buffer)
    // The EBML magic (RFC 8794 §8.1): the stored object is the WebM itself.
    expect([...Buffer.concat(bytes)]).toEqual([0x1a, 0x45, 0xdf, 0xa3])
  }
})

it('seeds a past visit with a recommendation in each state, whose outcomes the next audit reports', async () => {
  // Seeded as of 10 March 2025 (2025-Q1): the quarter before last is 2024-Q3, ending
  // 30 September 2024; the visit ended ten days before, on 20 September, from 16 September.
  const [past] = await database.db
    .select()
    .from(visits)
    .where(and(eq(visits.clubId, clubId), eq(visits.lastDay, '2024-09-20')))
  expect(past).toMatchObject({ firstDay: '2024-09-16' })
  const recs = await database.db
    .select()
    .from(recommendations)
    .where(eq(recommendations.visitId, past!.id))
  expect(recs.map((r) => r.status).sort()).toEqual(['accepted', 'declined', 'done', 'open'])
  const byDate = await database.db
    .select({ asOf: audits.asOf, visitOutcomes: audits.visitOutcomes })
    .from(audits)
    .where(eq(audits.clubId, clubId))
  const next = byDate.find((a) => a.asOf === '2024-09-30')!
  expect(next.visitOutcomes!.recommendations).toHaveLength(4)
  // The accepted and the done one were placed on records the history moves before the audit.
  expect(next.visitOutcomes!.summary).toMatchObject({ accepted: 2, acceptedMoved: 2 })
  expect(next.visitOutcomes!.summary.comparable).toBeGreaterThan(0)
  // The audit after it no longer reports that visit; the one before did not yet.
  expect(byDate.find((a) => a.asOf === '2024-12-31')!.visitOutcomes).toBeNull()
  expect(byDate.find((a) => a.asOf === '2024-06-30')!.visitOutcomes).toBeNull()
})
