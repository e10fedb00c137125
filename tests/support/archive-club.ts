import { createHash } from 'node:crypto'
import Papa from 'papaparse'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import { expect } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { appendHistory } from '../../server/services/progress-history.ts'
import type { ClubArchiveJob } from '../../shared/schemas/archives.ts'
import type { TestApp } from './app.ts'
import { clubWithPeople, floorTucks, signedIn } from './fixtures.ts'

type Club = Awaited<ReturnType<typeof clubWithPeople>>

/** An event note a spreadsheet would run as a formula. */
export const formulaNote = '=HYPERLINK("http://example.invalid","x")'

export const sha256 = (data: Buffer) => createHash('sha256').update(data).digest('hex')

/** The data rows of a CSV file, by column name. */
export const csvRows = (data: Buffer) =>
  Papa.parse<Record<string, string>>(data.toString('utf8'), { header: true, skipEmptyLines: true })
    .data

/**
 * A small club with known data: two athletes, seven events of which a step logged by mistake
 * and the correction voiding it, three records, an audit, an open invitation and a reset link;
 * and a second club, with an athlete and an event, whose data must stay out of the first one's
 * archive.
 */
export async function archiveClub(database: Database, t: TestApp) {
  const athlete = async (club: Club, givenName: string, familyName: string) =>
    (
      await createAthlete(database.db, club.club.id, {
        givenName,
        familyName,
        birthYear: 2012,
        squadId: club.squad.id,
        discipline: 'artistic-women',
      })
    ).id
  const fx = await clubWithPeople(database.db, 'archive')
  const other = await clubWithPeople(database.db, 'elsewhere')
  const director = await signedIn(t, fx.people.director.email)
  const base = `/api/clubs/${fx.club.id}`
  const { backTuck, frontTuck } = await floorTucks(database.db, fx.club.id)
  const ada = await athlete(fx, 'Ada', 'Quillmere')
  const bea = await athlete(fx, 'Bea', 'Harrowfield')
  const coach = await signedIn(t, fx.people.coach.email)
  const first = await coach
    .post(`${base}/athletes/${ada}/events`)
    .send({
      elementId: backTuck,
      kind: 'step',
      stepIndex: 0,
      occurredOn: '2026-05-02',
      note: formulaNote,
      expectedLastEventId: null,
    })
    .expect(201)
  const correctedEventId: string = first.body.record.lastEventId
  const fix = await coach
    .post(`${base}/athletes/${ada}/events`)
    .send({
      elementId: backTuck,
      kind: 'step',
      stepIndex: 0,
      occurredOn: '2026-05-03',
      correctsEventId: correctedEventId,
      expectedLastEventId: correctedEventId,
    })
    .expect(201)
  const correctionEventId: string = fix.body.record.lastEventId
  const step = (athleteId: string, elementId: string, stepIndex: number, occurredOn: string) => ({
    athleteId,
    elementId,
    coachId: fx.people.coach.id,
    change: { kind: 'step' as const, stepIndex, occurredOn, skipReason: 'Assessed' },
  })
  await appendHistory(database.db, fx.club.id, [
    step(ada, backTuck, 1, '2026-05-10'),
    step(ada, backTuck, 2, '2026-05-20'),
    step(bea, backTuck, 1, '2026-05-10'),
    step(bea, frontTuck, 1, '2026-05-12'),
    step(bea, frontTuck, 2, '2026-06-01'),
  ])
  await runAndStore(
    database.db,
    { clubId: fx.club.id, userId: fx.people.director.id, role: 'director' },
    { squadId: null },
  )

  const theirAthlete = await athlete(other, 'Zephyrine', 'Otherclubson')
  const { backTuck: theirTuck } = await floorTucks(database.db, other.club.id)
  await appendHistory(database.db, other.club.id, [
    { ...step(theirAthlete, theirTuck, 0, '2026-05-01'), coachId: other.people.coach.id },
  ])
  // Secrets that exist in the database and must not reach the archive.
  await director
    .post(`${base}/invitations`)
    .send({ email: 'invited-archive@test.example', role: 'coach' })
    .expect(201)
  await request(t.app)
    .post('/api/auth/password-reset/request')
    .send({ email: fx.people.director.email })
    .expect(202)
  return { fx, other, director, base, correctedEventId, correctionEventId, theirAthlete }
}

/** Asks for an archive and polls it until it is no longer running; expects it done. */
export async function makeArchive(agent: TestAgent, base: string) {
  const started = await agent.post(`${base}/archives`).expect(202)
  let job = started.body as ClubArchiveJob
  expect(job).toMatchObject({ status: 'running', phase: 'queued' })
  for (let i = 0; i < 400 && job.status === 'running'; i++) {
    await new Promise((r) => setTimeout(r, 25))
    job = (await agent.get(`${base}/archives/${job.id}`).expect(200)).body
  }
  expect(job.status).toBe('done')
  return job
}

/** GET …/archives/:id/download with the body as a Buffer. */
export const downloadArchive = (agent: TestAgent, base: string, id: string) =>
  agent
    .get(`${base}/archives/${id}/download`)
    .buffer(true)
    .parse((res, callback) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => callback(null, Buffer.concat(chunks)))
    })
