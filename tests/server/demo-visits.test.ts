import { eq } from 'drizzle-orm'
import { afterAll, beforeAll, expect, it } from 'vitest'
import { seedDemo } from '../../seed/demo.ts'
import type { Database } from '../../server/db/client.ts'
import { recommendations, visits } from '../../server/db/schema-visits.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'

let database: Database
let t: TestApp
let clubId: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database, { worker: false })
  const seeded = await seedDemo(database.db, { today: new Date('2025-03-10T12:00:00Z') })
  clubId = seeded.club.id
}, 120_000)
afterAll(async () => {
  await t.close()
  await database.close()
})

it('seeds one visit open around the day of seeding, covering one squad, with recommendations in three states', async () => {
  const [visit] = await database.db.select().from(visits).where(eq(visits.clubId, clubId))
  // Seeded as of 10 March 2025: a week before is 3 March, three weeks after is 31 March.
  expect(visit).toMatchObject({ firstDay: '2025-03-03', lastDay: '2025-03-31' })
  const recs = await database.db
    .select()
    .from(recommendations)
    .where(eq(recommendations.clubId, clubId))
  expect(recs.map((r) => r.status).sort()).toEqual(['accepted', 'declined', 'open'])
  expect(recs.find((r) => r.status === 'open')!.suggestedStepIndex).toBe(1)
})
