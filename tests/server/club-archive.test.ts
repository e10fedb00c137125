import { and, count, eq } from 'drizzle-orm'
import pino from 'pino'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { purgeExpired } from '../../server/auth/purge.ts'
import { plannerStations, sessionPlans } from '../../server/db/schema-planner.ts'
import type { Database } from '../../server/db/client.ts'
import {
  invitationTokens,
  passwordResets,
  sessions,
  users,
} from '../../server/db/schema-accounts.ts'
import { progressEvents } from '../../server/db/schema-athletes.ts'
import { clubArchiveFiles, clubArchives } from '../../server/db/schema-audits.ts'
import { buildClubArchive, type ArchiveProgress } from '../../server/services/archive-zip.ts'
import { processClubArchive } from '../../server/services/club-archives.ts'
import {
  archivePhases,
  archiveManifestSchema,
  type ArchiveManifest,
  type ClubArchiveJob,
} from '../../shared/schemas/archives.ts'
import {
  archiveClub,
  csvRows,
  downloadArchive,
  formulaNote,
  makeArchive,
  sha256,
} from '../support/archive-club.ts'
import { tablesWithClubId } from '../support/catalog.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { signedIn } from '../support/fixtures.ts'
import { readZip } from '../support/zip.ts'

/** Each club table and the file of the archive that holds its rows, one row each. */
const archivedIn: Record<string, string> = {
  memberships: 'members.csv',
  squads: 'squads.csv',
  coach_squads: 'coach-assignments.csv',
  athletes: 'athletes.csv',
  elements: 'elements.csv',
  element_steps: 'progression-steps.csv',
  element_step_maps: 'progression-step-maps.csv',
  element_prerequisites: 'prerequisites.csv',
  progression_templates: 'progression-templates.json',
  progress_events: 'progress-events.csv',
  progress_records: 'progress-records.csv',
  requirement_profiles: 'requirement-profiles.json',
  age_thresholds: 'age-thresholds.csv',
  audits: 'audits.csv',
  visits: 'visits.csv',
  visit_squads: 'visit-squads.csv',
  recommendations: 'recommendations.csv',
  recommendation_events: 'recommendation-history.csv',
  clips: 'clips.csv',
  clip_reviews: 'clip-reviews.csv',
  planner_stations: 'planner-stations.csv',
  session_plans: 'session-plans.json',
}
/** Tables with club_id whose rows the archive leaves out, with the reason. */
const leftOut: Record<string, string> = {
  sessions: 'sign-in sessions: secrets, and club_id only names the club last worked in',
  invitations: 'access on its way to someone, not yet the club’s; it ends with the club',
  invitation_tokens: 'the secret links of invitations',
  audit_runs: 'requests for audits; the audits themselves are in the archive',
  club_archives: 'the archives themselves',
  club_archive_files: 'the archives themselves',
  report_pdfs: 'PDF reports drawn for one person for an hour; the audits are in the archive',
  report_pdf_files: 'PDF reports drawn for one person for an hour; the audits are in the archive',
}

// A small club with known data and a second club (tests/support/archive-club.ts).

let database: Database
let t: TestApp
let c: Awaited<ReturnType<typeof archiveClub>>
let fx: (typeof c)['fx']
let director: TestAgent
let base: string

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  c = await archiveClub(database, t)
  ;({ fx, director, base } = c)
  // The planner's rows: two stations and a saved plan here, a station of the other club.
  await database.db.insert(plannerStations).values([
    {
      clubId: fx.club.id,
      name: 'Big trampoline',
      modality: 'trampoline',
      capacity: 1,
      secondsPerTurn: 40,
      needsSpotter: false,
    },
    {
      clubId: fx.club.id,
      name: 'Hand spot',
      modality: 'hand-spot',
      capacity: 1,
      secondsPerTurn: 30,
      needsSpotter: true,
    },
    {
      clubId: c.other.club.id,
      name: 'Their pit',
      modality: 'pit',
      capacity: 2,
      secondsPerTurn: 20,
      needsSpotter: false,
    },
  ])
  await database.db.insert(sessionPlans).values({
    clubId: fx.club.id,
    squadId: fx.squad.id,
    sessionDate: '2026-05-04',
    model: {
      minutes: 20,
      blocks: 2,
      changeoverSeconds: 60,
      coaches: 1,
      stations: [],
      athletes: [],
    },
    placements: [],
  })
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const finishedArchive = () => makeArchive(director, base)
const download = (id: string) => downloadArchive(director, base, id)

describe('a club archive', () => {
  let job: ClubArchiveJob
  let files: Map<string, Buffer>
  let manifest: ArchiveManifest

  beforeAll(async () => {
    job = await finishedArchive()
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

  it('holds every club table, row for row, but those it leaves out for a stated reason', async () => {
    const tables = await tablesWithClubId(database.pool)
    expect(tables).toEqual(Object.keys({ ...archivedIn, ...leftOut }).sort())
    for (const [table, file] of Object.entries(archivedIn)) {
      const { rows } = await database.pool.query<{ n: number }>(
        `select count(*)::int as n from "${table}" where club_id = $1`,
        [fx.club.id],
      )
      const listed = manifest.files.find((f) => f.name === file)
      expect(listed?.rows, `${table} in ${file}`).toBe(rows[0]!.n)
    }
  })

  it('holds the gym’s stations and the saved session plans of this club alone', () => {
    const stations = csvRows(files.get('planner-stations.csv')!)
    expect(stations.map((r) => [r.name, r.modality, r.needsSpotter])).toEqual([
      ['Big trampoline', 'trampoline', 'false'],
      ['Hand spot', 'hand-spot', 'true'],
    ])
    const plans = JSON.parse(files.get('session-plans.json')!.toString()) as {
      squadId: string
      sessionDate: string
      model: { minutes: number }
    }[]
    expect(plans.map((p) => [p.squadId, p.sessionDate, p.model.minutes])).toEqual([
      [fx.squad.id, '2026-05-04', 20],
    ])
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
    expect(events.find((e) => e.id === c.correctionEventId)!.correctsEventId).toBe(
      c.correctedEventId,
    )
    // A note a spreadsheet would run as a formula is written as text.
    expect(events.find((e) => e.id === c.correctedEventId)!.note).toBe(`'${formulaNote}`)
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
      c.other.club.id,
      c.other.club.name,
      c.other.squad.id,
      'Zephyrine',
      c.theirAthlete,
      c.other.people.coach.email,
      c.other.people.coach.id,
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
    const job = await finishedArchive()
    const paths = [`${base}/archives/${job.id}`, `${base}/archives/${job.id}/download`]
    for (const role of ['coach', 'clinician', 'board'] as const) {
      const agent = await signedIn(t, fx.people[role].email)
      await agent.post(`${base}/archives`).expect(403)
      for (const path of paths) await agent.get(path).expect(403)
    }
    const outsider = await signedIn(t, c.other.people.director.email)
    await outsider.post(`${base}/archives`).expect(404)
    for (const path of paths) await outsider.get(path).expect(404)
    // Their own club's address with this club's archive id finds nothing either.
    const theirs = `/api/clubs/${c.other.club.id}/archives/${job.id}`
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
    const kept = await finishedArchive()
    const job = await finishedArchive()
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
