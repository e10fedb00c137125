import { count, eq } from 'drizzle-orm'
import { describe, expect, it } from 'vitest'
import { prepareDatabase } from '../../server/cli/bootstrap.ts'
import { clubs, memberships } from '../../server/db/schema-accounts.ts'
import { athletes, coachSquads, squads } from '../../server/db/schema-athletes.ts'
import { demoClub } from '../../seed/demo.ts'
import { demoClubElements } from '../../seed/demo-elements.ts'
import { listElements } from '../../server/services/catalogue.ts'
import { freshDatabase } from '../support/database.ts'

describe('start-up preparation', () => {
  it('loads the demo club once: a second start keeps the data and loads nothing', async () => {
    const database = await freshDatabase()
    try {
      const today = new Date('2026-12-01T12:00:00Z')
      const first = await prepareDatabase(database.url, { today })
      expect(first?.club.name).toBe(demoClub.name)

      // Something a user changed between the two starts must survive the second.
      await database.db.update(clubs).set({ name: 'Renamed by the director' })

      const second = await prepareDatabase(database.url, { today })
      expect(second).toBeNull()
      const [clubRows] = await database.db.select({ n: count() }).from(clubs)
      expect(clubRows?.n).toBe(1)
      const [club] = await database.db.select().from(clubs)
      expect(club?.name).toBe('Renamed by the director')
    } finally {
      await database.close()
    }
  })

  it('seeds the demo scenario: 4 squads from development to senior, about 60 athletes, 5 coaches', async () => {
    const database = await freshDatabase()
    try {
      await prepareDatabase(database.url, { today: new Date('2026-12-01T12:00:00Z') })
      const squadRows = await database.db.select().from(squads)
      expect(squadRows.map((s) => s.level).sort()).toEqual([
        'development',
        'intermediate',
        'junior',
        'senior',
      ])
      const [athleteCount] = await database.db.select({ n: count() }).from(athletes)
      expect(athleteCount?.n).toBeGreaterThanOrEqual(55)
      expect(athleteCount?.n).toBeLessThanOrEqual(65)
      const coaches = await database.db
        .select()
        .from(memberships)
        .where(eq(memberships.role, 'coach'))
      expect(coaches).toHaveLength(5)
      const assignments = await database.db.select().from(coachSquads)
      expect(new Set(assignments.map((a) => a.userId)).size).toBe(5)
      // the standard catalogue plus the club's own backward elements, which have no forward mirror
      const [club] = await database.db.select().from(clubs)
      const catalogue = await listElements(database.db, club!.id)
      expect(catalogue.length).toBeGreaterThanOrEqual(80)
      const gaps = catalogue.filter((e) => e.direction === 'backward' && e.counterpartId === null)
      expect(gaps.map((e) => e.name).sort()).toEqual(demoClubElements.map((e) => e.name).sort())
    } finally {
      await database.close()
    }
  })

  it('is deterministic: the same day gives the same athletes', async () => {
    const a = await freshDatabase()
    const b = await freshDatabase()
    try {
      const today = new Date('2026-12-01T12:00:00Z')
      await prepareDatabase(a.url, { today })
      await prepareDatabase(b.url, { today })
      const list = async (db: typeof a.db) =>
        (await db.select().from(athletes))
          .map((x) => `${x.givenName} ${x.familyName} ${x.birthYear}`)
          .sort()
      expect(await list(a.db)).toEqual(await list(b.db))
    } finally {
      await a.close()
      await b.close()
    }
  })
})
