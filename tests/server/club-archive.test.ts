import { createHash } from 'node:crypto'
import { and, count, eq } from 'drizzle-orm'
import Papa from 'papaparse'
import pino from 'pino'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { purgeExpired } from '../../server/auth/purge.ts'
import type { Database } from '../../server/db/client.ts'
import {
  clubArchiveFiles,
  clubArchives,
  invitationTokens,
  passwordResets,
  progressEvents,
  sessions,
  users,
} from '../../server/db/schema.ts'
import { buildClubArchive, type ArchiveProgress } from '../../server/services/archive-zip.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { processClubArchive } from '../../server/services/club-archives.ts'
import { appendHistory } from '../../server/services/progress.ts'
import {
  archivePhases,
  archiveManifestSchema,
  type ArchiveManifest,
  type ClubArchiveJob,
} from '../../shared/schemas/archives.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { clubWithPeople, floorTucks, signedIn } from '../support/fixtures.ts'
import { readZip } from '../support/zip.ts'

// A small club with known data (two athletes, a history with a correction, an audit) and a
// second club whose data must stay out of the first one's archive.

type Club = Awaited<ReturnType<typeof clubWithPeople>>

let database: Database
let t: TestApp
let fx: Club
let other: Club
let director: TestAgent
let base: string
let correctedEventId: string
let correctionEventId: string
let theirAthlete: string
const formulaNote = '=HYPERLINK("http://example.invalid","x")'

const sha256 = (data: Buffer) => createHash('sha256').update(data).digest('hex')
const csvRows = (data: Buffer) =>
  Papa.parse<Record<string, string>>(data.toString('utf8'), { header: true, skipEmptyLines: true })
    .data

async function athlete(club: Club, givenName: string, familyName: string) {
  return (
    await createAthlete(database.db, club.club.id, {
      givenName,
      familyName,
      birthYear: 2012,
      squadId: club.squad.id,
      discipline: 'artistic-women',
    })
  ).id
}

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  fx = await clubWithPeople(database.db, 'archive')
  other = await clubWithPeople(database.db, 'elsewhere')
  director = await signedIn(t, fx.people.director.email)
  base = `/api/clubs/${fx.club.id}`
  const { backTuck, frontTuck } = await floorTucks(database.db, fx.club.id)
  const ada = await athlete(fx, 'Ada', 'Quillmere')
  const bea = await athlete(fx, 'Bea', 'Harrowfield')
  const coach = await signedIn(t, fx.people.coach.email)
  // A step logged by mistake, then voided by a correction: both stay in the history.
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
  correctedEventId = first.body.record.lastEventId
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
  correctionEventId = fix.body.record.lastEventId
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

  theirAthlete = await athlete(other, 'Zephyrine', 'Otherclubson')
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
})
afterAll(async () => {
  await t.close()
  await database.close()
})

/** Asks for an archive and polls it until it is no longer running. */
async function makeArchive(agent = director) {
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

const download = (id: string, agent = director) =>
  agent
    .get(`${base}/archives/${id}/download`)
    .buffer(true)
    .parse((res, callback) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => callback(null, Buffer.concat(chunks)))
    })

describe('a club archive', () => {
  let job: ClubArchiveJob
  let files: Map<string, Buffer>
  let manifest: ArchiveManifest

  beforeAll(async () => {
    job = await makeArchive()
    const res = await download(job.id).expect(200)
    files = readZip(res.body as Buffer)
    manifest = archiveManifestSchema.parse(JSON.parse(files.get('manifest.json')!.toString()))
  })

  it('is a zip named after the club and the day, matching the size and hash it reports', async () => {
    const res = await download(job.id).expect(200)
    expect(res.headers['content-type']).toBe('application/zip')
    const day = job.createdAt.slice(0, 10)
    expect(res.headers['content-disposition']).toBe(
      `attachment; filename="test-archive-${day}.zip"`,
    )
    expect(res.headers['cache-control']).toContain('no-store')
    const body = res.body as Buffer
    expect(body.length).toBe(job.bytes)
    expect(sha256(body)).toBe(job.sha256)
  })

  it('lists every file in its manifest with the right rows, bytes and SHA-256', () => {
    expect(manifest.club).toEqual({ id: fx.club.id, name: fx.club.name })
    const names = manifest.files.map((f) => f.name)
    expect([...files.keys()].sort()).toEqual([...names, 'manifest.json'].sort())
    expect(names).toEqual(
      expect.arrayContaining([
        'club.json',
        'members.csv',
        'squads.csv',
        'coach-assignments.csv',
        'athletes.csv',
        'elements.csv',
        'progression-steps.csv',
        'progression-step-maps.csv',
        'prerequisites.csv',
        'progression-templates.json',
        'progress-events.csv',
        'progress-records.csv',
        'requirement-profiles.json',
        'age-thresholds.csv',
        'audits.csv',
      ]),
    )
    for (const entry of manifest.files) {
      const data = files.get(entry.name)!
      expect(sha256(data), entry.name).toBe(entry.sha256)
      expect(data.length, entry.name).toBe(entry.bytes)
      const parsed: unknown = entry.name.endsWith('.json') ? JSON.parse(data.toString()) : null
      const rows = entry.name.endsWith('.csv')
        ? csvRows(data).length
        : Array.isArray(parsed)
          ? parsed.length
          : 1
      expect(rows, entry.name).toBe(entry.rows)
    }
    expect(manifest.files.find((f) => f.name === 'athletes.csv')!.rows).toBe(2)
    expect(manifest.files.find((f) => f.name === 'members.csv')!.rows).toBe(4)
  })

  it('holds the full history of events, the correction and the event it voids included', async () => {
    const events = csvRows(files.get('progress-events.csv')!)
    const stored = await database.db
      .select()
      .from(progressEvents)
      .where(eq(progressEvents.clubId, fx.club.id))
    expect(events.map((e) => e.id).sort()).toEqual(stored.map((e) => e.id).sort())
    expect(events).toHaveLength(7)
    for (const row of stored) {
      const written = events.find((e) => e.id === row.id)!
      expect(written).toMatchObject({
        athleteId: row.athleteId,
        elementId: row.elementId,
        kind: row.kind,
        stepIndex: String(row.stepIndex),
        occurredOn: row.occurredOn,
        recordedAt: row.recordedAt.toISOString(),
        correctsEventId: row.correctsEventId ?? '',
      })
    }
    expect(events.find((e) => e.id === correctionEventId)!.correctsEventId).toBe(correctedEventId)
    // A note a spreadsheet would run as a formula is written as text.
    expect(events.find((e) => e.id === correctedEventId)!.note).toBe(`'${formulaNote}`)
    const records = csvRows(files.get('progress-records.csv')!)
    expect(records).toHaveLength(3)
  })

  it('holds the members, the catalogue with its derived fields and each audit unpacked', () => {
    const members = csvRows(files.get('members.csv')!)
    expect(members.map((m) => [m.email, m.role]).sort()).toEqual(
      Object.values(fx.people)
        .map((p) => [p.email, p.role])
        .sort(),
    )
    expect(members.find((m) => m.role === 'clinician')!.accessStartsOn).toMatch(/^\d{4}-\d\d-\d\d$/)
    const athletes = csvRows(files.get('athletes.csv')!)
    expect(athletes.map((a) => a.givenName).sort()).toEqual(['Ada', 'Bea'])
    expect(athletes[0]!.squad).toBe('Squad A')
    const backTuck = csvRows(files.get('elements.csv')!).find(
      (e) =>
        e.apparatus === 'floor' &&
        e.direction === 'backward' &&
        e.quarterRotations === '4' &&
        e.twists === '0' &&
        e.shape === 'tuck',
    )!
    expect(backTuck).toMatchObject({ rotationClass: 'single', twistBand: 'none', saltoCount: '1' })
    expect(backTuck.counterpartKey).not.toBe('')
    const auditFile = manifest.files.find((f) => f.name.startsWith('audits/'))!
    const audit = JSON.parse(files.get(auditFile.name)!.toString())
    expect(audit.result).not.toHaveProperty('format')
    expect(audit.result).not.toHaveProperty('gapElements')
    expect(audit.result.gaps.length).toBeGreaterThan(0)
    expect(audit.result.gaps[0]).toHaveProperty('elementName')
    const summary = csvRows(files.get('audits.csv')!)
    expect(summary).toHaveLength(1)
    expect(summary[0]).toMatchObject({ id: audit.id, file: auditFile.name })
    expect(Number(summary[0]!.clubFrontLag)).toBeCloseTo(audit.result.headline.clubFrontLag, 10)
  })

  it('holds no password hash, session, token nor anything of another club', async () => {
    const hashes = await database.db.select({ hash: users.passwordHash }).from(users)
    const sessionIds = await database.db.select({ id: sessions.id }).from(sessions)
    const resetHashes = await database.db
      .select({ hash: passwordResets.tokenHash })
      .from(passwordResets)
    const inviteHashes = await database.db
      .select({ hash: invitationTokens.tokenHash })
      .from(invitationTokens)
    const secrets = [
      '$argon2',
      ...hashes.map((h) => h.hash!),
      ...sessionIds.map((s) => s.id),
      ...resetHashes.map((r) => r.hash),
      ...inviteHashes.map((r) => r.hash),
    ]
    expect(sessionIds.length).toBeGreaterThan(0)
    expect(resetHashes.length).toBeGreaterThan(0)
    expect(inviteHashes.length).toBeGreaterThan(0)
    const theirs = [
      other.club.id,
      other.club.name,
      other.squad.id,
      'Zephyrine',
      theirAthlete,
      other.people.coach.email,
      other.people.coach.id,
    ]
    for (const [name, data] of files) {
      const text = data.toString('utf8')
      for (const secret of [...secrets, ...theirs]) expect(text, name).not.toContain(secret)
    }
  })
})

describe('building an archive', () => {
  it('writes the same files page by page, its progress advancing through the phases', async () => {
    const reports: ArchiveProgress[] = []
    const paged = await buildClubArchive(database.db, fx.club.id, {
      pageSize: 2,
      onProgress: (p) => reports.push(p),
    })
    const whole = await buildClubArchive(database.db, fx.club.id)
    const hashes = (m: ArchiveManifest) => m.files.map((f) => [f.name, f.sha256, f.rows])
    expect(hashes(paged.manifest)).toEqual(hashes(whole.manifest))
    // 7 events, 3 records and 2 athletes in pages of 2: 4 + 2 + 1 parts instead of 3.
    expect(paged.total).toBe(whole.total + 4)
    const dones = reports.map((r) => r.done)
    expect(dones).toEqual([...dones].sort((a, b) => a - b))
    expect(new Set(dones)).toEqual(new Set(Array.from({ length: paged.total + 1 }, (_, i) => i)))
    expect(reports.every((r) => r.total === paged.total)).toBe(true)
    const phases = reports.map((r) => archivePhases.indexOf(r.phase))
    expect(phases).toEqual([...phases].sort((a, b) => a - b))
    expect(new Set(reports.map((r) => r.phase))).toEqual(
      new Set([
        'club',
        'people',
        'squads',
        'athletes',
        'catalogue',
        'progress',
        'settings',
        'audits',
        'manifest',
      ]),
    )
  })

  it('stores its progress, and stores the zip once when two workers build it', async () => {
    const [row] = await database.db
      .insert(clubArchives)
      .values({ clubId: fx.club.id, expiresAt: new Date(Date.now() + 3_600_000) })
      .returning()
    const job = { clubId: fx.club.id, archiveId: row!.id, lastAttempt: false }
    const logger = pino({ level: 'silent' })
    await Promise.all([
      processClubArchive(database.db, logger, job, { pageSize: 2 }),
      processClubArchive(database.db, logger, job, { pageSize: 2 }),
    ])
    const where = and(eq(clubArchives.clubId, fx.club.id), eq(clubArchives.id, row!.id))
    const [stored] = await database.db.select().from(clubArchives).where(where)
    expect(stored).toMatchObject({ status: 'done', phase: 'done' })
    expect(stored!.total).toBeGreaterThan(20)
    expect(stored!.done).toBe(stored!.total)
    const [files] = await database.db
      .select({ n: count() })
      .from(clubArchiveFiles)
      .where(eq(clubArchiveFiles.archiveId, row!.id))
    expect(files!.n).toBe(1)
    const res = await download(row!.id).expect(200)
    expect(sha256(res.body as Buffer)).toBe(stored!.sha256)
  })
})

describe('who may take the data away', () => {
  it('refuses coaches, clinicians and the board, and hides the club from other directors', async () => {
    const job = await makeArchive()
    const paths = [`${base}/archives/${job.id}`, `${base}/archives/${job.id}/download`]
    for (const role of ['coach', 'clinician', 'board'] as const) {
      const agent = await signedIn(t, fx.people[role].email)
      await agent.post(`${base}/archives`).expect(403)
      for (const path of paths) await agent.get(path).expect(403)
    }
    const outsider = await signedIn(t, other.people.director.email)
    await outsider.post(`${base}/archives`).expect(404)
    for (const path of paths) await outsider.get(path).expect(404)
    // Their own club's address with this club's archive id finds nothing either.
    const theirs = `/api/clubs/${other.club.id}/archives/${job.id}`
    await outsider.get(theirs).expect(404)
    await outsider.get(`${theirs}/download`).expect(404)
  })
})

describe('the life of an archive', () => {
  it('cannot be downloaded while it is being made', async () => {
    const [row] = await database.db
      .insert(clubArchives)
      .values({ clubId: fx.club.id, expiresAt: new Date(Date.now() + 3_600_000) })
      .returning()
    const res = await director.get(`${base}/archives/${row!.id}/download`).expect(409)
    expect(res.body.error.code).toBe('archive_not_ready')
  })

  it('answers 410 once its 24 hours are over, and the purge then deletes it', async () => {
    const kept = await makeArchive()
    const job = await makeArchive()
    const where = and(eq(clubArchives.clubId, fx.club.id), eq(clubArchives.id, job.id))
    const [row] = await database.db.select().from(clubArchives).where(where)
    const expiresIn = row!.expiresAt.getTime() - row!.finishedAt!.getTime()
    expect(expiresIn).toBe(24 * 60 * 60 * 1000)
    await database.db
      .update(clubArchives)
      .set({ expiresAt: new Date(Date.now() - 1_000) })
      .where(where)
    const gone = await director.get(`${base}/archives/${job.id}/download`).expect(410)
    expect(gone.body.error.code).toBe('archive_expired')
    expect((await director.get(`${base}/archives/${job.id}`).expect(200)).body.status).toBe(
      'expired',
    )

    const purged = await purgeExpired(database.db)
    expect(purged.archives).toBeGreaterThanOrEqual(1)
    expect(await database.db.select().from(clubArchives).where(where)).toEqual([])
    const bytes = await database.db
      .select({ id: clubArchiveFiles.archiveId })
      .from(clubArchiveFiles)
      .where(eq(clubArchiveFiles.archiveId, job.id))
    expect(bytes).toEqual([])
    await director.get(`${base}/archives/${job.id}`).expect(404)
    await director.get(`${base}/archives/${job.id}/download`).expect(404)
    // One still within its 24 hours is kept.
    await download(kept.id).expect(200)
  })
})
