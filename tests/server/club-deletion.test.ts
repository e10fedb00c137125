import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { users } from '../../server/db/schema-accounts.ts'
import {
  clubArchiveFiles,
  clubArchives,
  reportPdfFiles,
  reportPdfs,
} from '../../server/db/schema-audits.ts'
import { elementPrerequisites, elementStepMaps } from '../../server/db/schema-catalogue.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { addMembership } from '../../server/services/members.ts'
import { appendHistory } from '../../server/services/progress-history.ts'
import { tablesWithClubId } from '../support/catalog.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'

// The list of tables comes from the live catalog, so a table added later is checked too.

type Club = Awaited<ReturnType<typeof clubWithPeople>>

let database: Database
let t: TestApp
let doomed: Club
let kept: Club
let director: TestAgent
let tables: string[]

/** Rows of the club in every table with club_id, by table. */
async function rowsByTable(clubId: string) {
  const counts: Record<string, number> = {}
  for (const table of tables) {
    const { rows } = await database.pool.query<{ n: number }>(
      `select count(*)::int as n from "${table}" where club_id = $1`,
      [clubId],
    )
    counts[table] = rows[0]!.n
  }
  return counts
}

/** Something in every table: athletes and their history, a step map, a prerequisite, an audit. */
async function populate(club: Club, agent: TestAgent) {
  const { clubId, db } = { clubId: club.club.id, db: database.db }
  const { backTuck, frontTuck } = await floorTucks(db, clubId)
  const athlete = await createAthlete(db, clubId, {
    givenName: 'Ola',
    familyName: 'Pendleby',
    birthYear: 2012,
    squadId: club.squad.id,
    discipline: 'artistic-women',
  })
  await appendHistory(db, clubId, [
    {
      athleteId: athlete.id,
      elementId: backTuck,
      coachId: club.people.coach.id,
      change: { kind: 'step', stepIndex: 0, occurredOn: '2026-05-10' },
    },
  ])
  await db
    .insert(elementStepMaps)
    .values({ clubId, elementId: backTuck, fromVersion: 1, mapping: [0] })
  await db
    .insert(elementPrerequisites)
    .values({ clubId, elementId: frontTuck, requiresElementId: backTuck, stepIndex: 0 })
  const access = { clubId, userId: club.people.director.id, role: 'director' as const }
  const auditId = await runAndStore(db, access, { squadId: null })
  const [archive] = await db
    .insert(clubArchives)
    .values({ clubId, expiresAt: new Date(Date.now() + 3_600_000), status: 'done' })
    .returning()
  await db
    .insert(clubArchiveFiles)
    .values({ clubId, archiveId: archive!.id, bytes: Buffer.from('zip') })
  const [pdf] = await db
    .insert(reportPdfs)
    .values({ clubId, auditId, requestedBy: access.userId, expiresAt: archive!.expiresAt })
    .returning()
  await db
    .insert(reportPdfFiles)
    .values({ clubId, reportPdfId: pdf!.id, bytes: Buffer.from('%PDF-') })
  await agent
    .post(`/api/clubs/${clubId}/invitations`)
    .send({ email: `invited-${clubId.slice(0, 8)}@test.example`, role: 'board' })
    .expect(201)
}

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  doomed = await clubWithPeople(database.db, 'doomed')
  kept = await clubWithPeople(database.db, 'kept')
  // The doomed club's director also coaches in the other club.
  await addMembership(database.db, {
    clubId: kept.club.id,
    userId: doomed.people.director.id,
    role: 'coach',
  })
  director = await signedIn(t, doomed.people.director.email)
  await populate(doomed, director)
  await populate(kept, await signedIn(t, kept.people.director.email))
  // The director's session now points at the doomed club.
  await director.get(`/api/clubs/${doomed.club.id}/`).expect(200)
  tables = await tablesWithClubId(database.pool)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const remove = (agent: TestAgent, body: unknown) =>
  agent.delete(`/api/clubs/${doomed.club.id}`).send(body as object)

describe('DELETE /api/clubs/:clubId', () => {
  it('is for directors only', async () => {
    for (const role of ['coach', 'clinician', 'board'] as const) {
      const res = await remove(await signedIn(t, doomed.people[role].email), {
        confirmName: doomed.club.name,
      })
      expect(res.status, role).toBe(403)
    }
    await director.get(`/api/clubs/${doomed.club.id}/`).expect(200)
  })

  it('refuses a name that is not the club’s exactly, naming the field', async () => {
    for (const body of [
      { confirmName: doomed.club.name.toLowerCase() },
      { confirmName: 'x' },
      {},
    ]) {
      const res = await remove(director, body)
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.error.issues[0].path).toBe('confirmName')
    }
    await director.get(`/api/clubs/${doomed.club.id}/`).expect(200)
  })

  it('leaves no row of the club in any table, and the other club as it was', async () => {
    const before = await rowsByTable(doomed.club.id)
    // Every table the club's data lives in today holds some of it, so the check means something.
    const filled = Object.keys(before).filter((table) => before[table]! > 0)
    expect(filled).toEqual(
      expect.arrayContaining([
        'age_thresholds',
        'athletes',
        'audits',
        'club_archive_files',
        'club_archives',
        'coach_squads',
        'element_prerequisites',
        'element_step_maps',
        'element_steps',
        'elements',
        'invitation_tokens',
        'invitations',
        'memberships',
        'progress_events',
        'progress_records',
        'progression_templates',
        'report_pdf_files',
        'report_pdfs',
        'requirement_profiles',
        'sessions',
        'squads',
      ]),
    )
    const otherBefore = await rowsByTable(kept.club.id)

    await remove(director, { confirmName: doomed.club.name }).expect(204)

    const after = await rowsByTable(doomed.club.id)
    expect(after).toEqual(Object.fromEntries(tables.map((table) => [table, 0])))
    const { rows } = await database.pool.query('select 1 from clubs where id = $1', [
      doomed.club.id,
    ])
    expect(rows).toEqual([])
    expect(await rowsByTable(kept.club.id)).toEqual(otherBefore)
  })

  it('keeps the people’s accounts, and takes the director to their other club', async () => {
    const everyone = await database.db.select({ id: users.id }).from(users)
    expect(everyone.map((u) => u.id)).toEqual(
      expect.arrayContaining(Object.values(doomed.people).map((p) => p.id)),
    )
    await director.get(`/api/clubs/${doomed.club.id}/`).expect(404)
    const me = (await director.get('/api/auth/me').expect(200)).body
    expect(me.memberships.map((m: { clubId: string }) => m.clubId)).toEqual([kept.club.id])
    expect(me.activeClubId).toBe(kept.club.id)
    const coach = await signedIn(t, doomed.people.coach.email)
    const alone = (await coach.get('/api/auth/me').expect(200)).body
    expect(alone).toMatchObject({ memberships: [], activeClubId: null })
  })
})
