import { submitAuditRun } from '../../server/services/audit-runs.ts'
import { randomBytes } from 'node:crypto'
import pino from 'pino'
import request from 'supertest'
import type TestAgent from 'supertest/lib/agent.js'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Role } from '../../shared/domain/club.ts'
import type { Database } from '../../server/db/client.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { createProfile } from '../../server/services/audit-profiles.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { listElements } from '../../server/services/catalogue.ts'
import { createElement } from '../../server/services/catalogue-writes.ts'
import { processClubArchive, submitClubArchive } from '../../server/services/club-archives.ts'
import { processReportPdf, submitReportPdf } from '../../server/services/report-pdfs.ts'
import { createClub } from '../../server/services/clubs.ts'
import { addMembership, createUser } from '../../server/services/members.ts'
import { createSquad } from '../../server/services/squads.ts'
import { createStation } from '../../server/services/planner.ts'
import { savePlan } from '../../server/services/planner-plans.ts'
import { cancelVisit, createVisit, listVisits } from '../../server/services/visits.ts'
import { requirementProfileSchema } from '../../shared/schemas/audits.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'
import { addDays, clubWithPeople, signedIn, testPassword } from '../support/fixtures.ts'
import { recommend, scheduleVisit } from '../support/visits.ts'
import { doubleSaltoProfile } from '../support/profiles.ts'

// Every route under /api/clubs/:clubId, with who may use it and what a permitted request gets.
// A route added to the server without a row here fails the first test; a row here without a
// route fails it too. Each row builds a valid request, so a permitted role gets the real answer.

type Fixture = Awaited<ReturnType<typeof clubWithPeople>> & {
  db: Database
  director: TestAgent
  t: TestApp
}
interface Row {
  allow: Role[]
  ok: number
  /**
   * The request, made as `role` (the director's for those outside the club); `clubId` when it
   * acts on a club of its own rather than the fixture's.
   */
  request: (f: Fixture, role: Role) => Promise<{ path: string; body?: unknown; clubId?: string }>
}

const unique = () => randomBytes(5).toString('hex')
async function throwawayMember(f: Fixture) {
  const user = await createUser(f.db.db, {
    email: `m-${unique()}@test.example`,
    name: 'Temp',
    password: testPassword,
  })
  await addMembership(f.db.db, { clubId: f.club.id, userId: user.id, role: 'coach' })
  return user.id
}
const elementBody = (name = `Element ${unique()}`) => ({
  name,
  apparatus: `custom-${unique()}`,
  direction: 'sideward',
  quarterRotations: 4,
  twists: [0],
  shape: 'tuck',
  takeOff: 'standing',
})
async function throwawayElement(f: Fixture) {
  const element = await createElement(
    f.db.db,
    { clubId: f.club.id, userId: f.people.director.id, role: 'director' },
    elementBody(),
  )
  return element.id
}
async function anyElement(f: Fixture) {
  return (await listElements(f.db.db, f.club.id))[0]!.id
}
async function athleteInSquad(f: Fixture) {
  const a = await createAthlete(f.db.db, f.club.id, {
    givenName: 'Matrix',
    familyName: unique(),
    birthYear: 2012,
    squadId: f.squad.id,
    discipline: 'artistic-women',
  })
  return a.id
}
// The EBML magic of a WebM (RFC 8794 §8.1) and a few bytes: enough for the type check.
const clipBytes = Buffer.concat([Buffer.from([0x1a, 0x45, 0xdf, 0xa3]), Buffer.alloc(60, 2)])
async function uploadedClip(f: Fixture) {
  const res = await f.director
    .post(`/api/clubs/${f.club.id}/clips`)
    .query({ athleteId: await athleteInSquad(f), elementId: await anyElement(f) })
    .send(clipBytes)
  return (res.body as { id: string }).id
}
async function erasableAthlete(f: Fixture) {
  const familyName = unique()
  const a = await createAthlete(f.db.db, f.club.id, {
    givenName: 'Erasable',
    familyName,
    birthYear: 2012,
    squadId: f.squad.id,
    discipline: 'artistic-women',
  })
  return { path: `/athletes/${a.id}/erase`, body: { confirmName: `Erasable ${familyName}` } }
}
/** A club of its own, with the fixture's people in the same roles, for deleting. */
async function throwawayClub(f: Fixture) {
  const label = unique()
  const club = await createClub(f.db.db, { name: `Throwaway ${label}`, slug: `throwaway-${label}` })
  for (const person of Object.values(f.people)) {
    const window =
      person.role === 'clinician' ? { accessStartsOn: addDays(-1), accessEndsOn: addDays(1) } : {}
    await addMembership(f.db.db, {
      clubId: club.id,
      userId: person.id,
      role: person.role,
      ...window,
    })
  }
  return { path: '/', body: { confirmName: club.name }, clubId: club.id }
}
const stepEvent = async (f: Fixture) => ({
  elementId: await anyElement(f),
  kind: 'step',
  stepIndex: 0,
  occurredOn: '2026-11-01',
  expectedLastEventId: null,
})
const writers: Role[] = ['director', 'coach']
const directorAccess = (f: Fixture) => ({
  clubId: f.club.id,
  userId: f.people.director.id,
  role: 'director' as const,
})
const newAudit = (f: Fixture) => runAndStore(f.db.db, directorAccess(f), { squadId: null })
const profile = doubleSaltoProfile('Test profile')
async function throwawayProfile(f: Fixture) {
  const input = requirementProfileSchema.parse({ ...profile, id: `matrix-${unique()}` })
  return (await createProfile(f.db.db, directorAccess(f), input)).id
}
const oneStep = [
  { name: 'Competition-ready', modality: 'routine', criterion: 'In a routine twice.' },
]
const readers: Role[] = ['director', 'coach', 'clinician']

const newArchive = (f: Fixture) => submitClubArchive(f.db.db, f.t.context.jobs, directorAccess(f))
/** An archive built here and now, ready to download. */
async function builtArchive(f: Fixture) {
  const { id } = await newArchive(f)
  const job = { clubId: f.club.id, archiveId: id, lastAttempt: true }
  await processClubArchive(f.db.db, pino({ level: 'silent' }), job)
  return id
}

/**
 * A PDF report of a new audit asked for by `role` (each reader may only poll and download their
 * own), drawn here and now when `drawn`.
 */
async function reportPdf(f: Fixture, role: Role, drawn: boolean) {
  const auditId = await newAudit(f)
  const access = { clubId: f.club.id, userId: f.people[role].id, role }
  const { id } = await submitReportPdf(f.db.db, f.t.context.jobs, access, auditId)
  if (drawn) {
    const job = { clubId: f.club.id, reportPdfId: id, lastAttempt: true }
    await processReportPdf(f.db.db, pino({ level: 'silent' }), job)
  }
  return id
}

async function pendingInvitation(f: Fixture) {
  const res = await f.director
    .post(`/api/clubs/${f.club.id}/invitations`)
    .send({ email: `i-${unique()}@test.example`, role: 'board' })
  return res.body.id as string
}

const stationBody = () => ({
  name: `Station ${unique()}`,
  modality: 'trampoline',
  capacity: 2,
  secondsPerTurn: 30,
  needsSpotter: false,
})
const throwawayStation = (f: Fixture) => createStation(f.db.db, f.club.id, stationBody())
async function planBody(f: Fixture) {
  const station = await throwawayStation(f)
  return {
    squadId: f.squad.id,
    sessionDate: addDays(0),
    model: {
      minutes: 20,
      blocks: 2,
      changeoverSeconds: 60,
      coaches: 1,
      stations: [station],
      athletes: [{ id: await athleteInSquad(f), name: 'Matrix athlete', options: [] }],
    },
    placements: [],
  }
}
async function throwawayPlan(f: Fixture) {
  const plan = await savePlan(f.db.db, directorAccess(f), await planBody(f))
  return plan.id
}

const matrix: Record<string, Row> = {
  'GET /': {
    allow: ['director', 'coach', 'clinician', 'board'],
    ok: 200,
    request: async () => ({ path: '/' }),
  },
  'DELETE /': { allow: ['director'], ok: 204, request: throwawayClub },
  'PATCH /settings': {
    allow: ['director'],
    ok: 200,
    request: async () => ({ path: '/settings', body: { lostSkillStepDown: 2 } }),
  },
  'GET /members': { allow: ['director'], ok: 200, request: async () => ({ path: '/members' }) },
  'PATCH /members/:userId': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({
      path: `/members/${await throwawayMember(f)}`,
      body: { role: 'board' },
    }),
  },
  'DELETE /members/:userId': {
    allow: ['director'],
    ok: 204,
    request: async (f) => ({ path: `/members/${await throwawayMember(f)}` }),
  },
  'GET /invitations': {
    allow: ['director'],
    ok: 200,
    request: async () => ({ path: '/invitations' }),
  },
  'POST /invitations': {
    allow: ['director'],
    ok: 201,
    request: async () => ({
      path: '/invitations',
      body: { email: `n-${unique()}@test.example`, role: 'coach' },
    }),
  },
  'POST /invitations/:id/resend': {
    allow: ['director'],
    ok: 204,
    request: async (f) => ({ path: `/invitations/${await pendingInvitation(f)}/resend` }),
  },
  'DELETE /invitations/:id': {
    allow: ['director'],
    ok: 204,
    request: async (f) => ({ path: `/invitations/${await pendingInvitation(f)}` }),
  },
  'GET /elements': { allow: readers, ok: 200, request: async () => ({ path: '/elements' }) },
  'POST /elements': {
    allow: ['director'],
    ok: 201,
    request: async () => ({ path: '/elements', body: elementBody() }),
  },
  'GET /elements/export': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/elements/export' }),
  },
  'POST /elements/import': {
    allow: ['director'],
    ok: 200,
    request: async () => ({
      path: '/elements/import',
      body: { dryRun: true, rows: [{ ...elementBody(), twists: '0', quarterRotations: '4' }] },
    }),
  },
  'GET /elements/:id': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/elements/${await anyElement(f)}` }),
  },
  'PATCH /elements/:id': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({ path: `/elements/${await throwawayElement(f)}`, body: elementBody() }),
  },
  'DELETE /elements/:id': {
    allow: ['director'],
    ok: 204,
    request: async (f) => ({ path: `/elements/${await throwawayElement(f)}` }),
  },
  'PUT /elements/:id/steps': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({
      path: `/elements/${await throwawayElement(f)}/steps`,
      body: { steps: oneStep, stepsVersion: 1 },
    }),
  },
  'PUT /elements/:id/prerequisites': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({
      path: `/elements/${await throwawayElement(f)}/prerequisites`,
      body: { prerequisites: [] },
    }),
  },
  'GET /progression-templates': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/progression-templates' }),
  },
  'PUT /progression-templates/:family': {
    allow: ['director'],
    ok: 200,
    request: async () => ({
      path: '/progression-templates/single-salto',
      body: { steps: oneStep },
    }),
  },
  'GET /squads': { allow: readers, ok: 200, request: async () => ({ path: '/squads' }) },
  'POST /squads': {
    allow: ['director'],
    ok: 201,
    request: async () => ({
      path: '/squads',
      body: { name: `Squad ${unique()}`, level: 'junior', discipline: 'tumbling' },
    }),
  },
  'GET /squads/:squadId': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/squads/${f.squad.id}` }),
  },
  'PATCH /squads/:squadId': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({
      path: `/squads/${f.squad.id}`,
      body: { name: 'Squad A', level: 'junior', discipline: 'artistic-women' },
    }),
  },
  'PUT /squads/:squadId/coaches': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({
      path: `/squads/${f.squad.id}/coaches`,
      body: { userIds: [f.people.coach.id] },
    }),
  },
  'GET /squads/:squadId/grid': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/squads/${f.squad.id}/grid` }),
  },
  'GET /athletes': { allow: readers, ok: 200, request: async () => ({ path: '/athletes' }) },
  'POST /athletes': {
    allow: writers,
    ok: 201,
    request: async (f) => ({
      path: '/athletes',
      body: {
        givenName: 'New',
        familyName: unique(),
        birthYear: 2013,
        squadId: f.squad.id,
        discipline: 'artistic-women',
      },
    }),
  },
  'POST /athletes/import': {
    allow: writers,
    ok: 200,
    request: async () => ({
      path: '/athletes/import',
      body: {
        dryRun: true,
        rows: [
          {
            givenName: 'Row',
            familyName: unique(),
            birthYear: '2012',
            squad: 'Squad A',
            discipline: '',
          },
        ],
      },
    }),
  },
  'GET /athletes/export': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/athletes/export' }),
  },
  'GET /athletes/:athleteId': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/athletes/${await athleteInSquad(f)}` }),
  },
  'PATCH /athletes/:athleteId': {
    allow: writers,
    ok: 200,
    request: async (f) => ({
      path: `/athletes/${await athleteInSquad(f)}`,
      body: { givenName: 'Renamed' },
    }),
  },
  'POST /athletes/:athleteId/erase': { allow: ['director'], ok: 204, request: erasableAthlete },
  'GET /athletes/:athleteId/records': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/athletes/${await athleteInSquad(f)}/records` }),
  },
  'GET /athletes/:athleteId/records/:elementId': {
    allow: readers,
    ok: 200,
    request: async (f) => ({
      path: `/athletes/${await athleteInSquad(f)}/records/${await anyElement(f)}`,
    }),
  },
  'POST /athletes/:athleteId/events/check': {
    allow: writers,
    ok: 200,
    request: async (f) => ({
      path: `/athletes/${await athleteInSquad(f)}/events/check`,
      body: await stepEvent(f),
    }),
  },
  'POST /athletes/:athleteId/events': {
    allow: writers,
    ok: 201,
    request: async (f) => ({
      path: `/athletes/${await athleteInSquad(f)}/events`,
      body: await stepEvent(f),
    }),
  },
  'GET /squads/:squadId/progress-batch': {
    allow: writers,
    ok: 200,
    request: async (f) => ({
      path: `/squads/${f.squad.id}/progress-batch?elementId=${await anyElement(f)}`,
    }),
  },
  'POST /squads/:squadId/progress-batch': {
    allow: writers,
    ok: 201,
    request: async (f) => ({
      path: `/squads/${f.squad.id}/progress-batch`,
      body: {
        elementId: await anyElement(f),
        occurredOn: '2026-11-01',
        entries: [
          {
            athleteId: await athleteInSquad(f),
            elementId: await anyElement(f),
            expectedLastEventId: null,
          },
        ],
      },
    }),
  },
  'GET /missing-skills': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/missing-skills' }),
  },
  'GET /progress-due': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/progress-due?days=14' }),
  },
  'GET /audits': { allow: readers, ok: 200, request: async () => ({ path: '/audits' }) },
  'POST /audits': {
    allow: ['director'],
    ok: 202,
    request: async () => ({ path: '/audits', body: { squadId: null } }),
  },
  'GET /audit-jobs/:jobId': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({
      path: `/audit-jobs/${(await submitAuditRun(f.t.context.db, f.t.context.jobs, directorAccess(f), { squadId: null })).id}`,
    }),
  },
  'GET /audits/:id': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/audits/${await newAudit(f)}` }),
  },
  'POST /audits/:id/recheck': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({ path: `/audits/${await newAudit(f)}/recheck` }),
  },
  'POST /audits/:id/publish': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({ path: `/audits/${await newAudit(f)}/publish` }),
  },
  'GET /audits/:id/gaps.csv': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/audits/${await newAudit(f)}/gaps.csv` }),
  },
  'GET /audits/:id/headline.csv': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/audits/${await newAudit(f)}/headline.csv` }),
  },
  'POST /audits/:id/report-pdfs': {
    allow: readers,
    ok: 202,
    request: async (f) => ({ path: `/audits/${await newAudit(f)}/report-pdfs` }),
  },
  'GET /report-pdfs/:id': {
    allow: readers,
    ok: 200,
    request: async (f, role) => ({ path: `/report-pdfs/${await reportPdf(f, role, false)}` }),
  },
  'GET /report-pdfs/:id/download': {
    allow: readers,
    ok: 200,
    request: async (f, role) => ({
      path: `/report-pdfs/${await reportPdf(f, role, true)}/download`,
    }),
  },
  'GET /requirement-profiles': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/requirement-profiles' }),
  },
  'POST /requirement-profiles': {
    allow: ['director'],
    ok: 201,
    request: async () => ({
      path: '/requirement-profiles',
      body: { ...profile, id: `new-${unique()}` },
    }),
  },
  'PUT /requirement-profiles/:id': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({
      path: `/requirement-profiles/${await throwawayProfile(f)}`,
      body: profile,
    }),
  },
  'DELETE /requirement-profiles/:id': {
    allow: ['director'],
    ok: 204,
    request: async (f) => ({ path: `/requirement-profiles/${await throwawayProfile(f)}` }),
  },
  'GET /age-thresholds': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/age-thresholds' }),
  },
  'PUT /age-thresholds/:discipline': {
    allow: ['director'],
    ok: 200,
    request: async () => ({
      path: '/age-thresholds/tumbling',
      body: { juniorFromAge: 13, seniorFromAge: 17, source: 'from memory' },
    }),
  },
  'POST /archives': { allow: ['director'], ok: 202, request: async () => ({ path: '/archives' }) },
  'GET /archives/:id': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({ path: `/archives/${(await newArchive(f)).id}` }),
  },
  'GET /archives/:id/download': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({ path: `/archives/${await builtArchive(f)}/download` }),
  },
  'GET /visits': {
    allow: ['director', 'clinician'],
    ok: 200,
    request: async () => ({ path: '/visits' }),
  },
  'POST /visits': {
    allow: ['director'],
    ok: 201,
    request: async (f) => ({
      path: '/visits',
      body: {
        clinicianId: f.people.clinician.id,
        firstDay: addDays(1),
        lastDay: addDays(3),
        squadIds: [f.squad.id],
      },
    }),
  },
  'PATCH /visits/:visitId': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({
      path: `/visits/${(await scheduleVisit(f.t.context, f)).id}`,
      body: { agenda: 'Vault runs first' },
    }),
  },
  'POST /visits/:visitId/cancel': {
    allow: ['director'],
    ok: 200,
    request: async (f) => ({ path: `/visits/${(await scheduleVisit(f.t.context, f)).id}/cancel` }),
  },
  'GET /recommendations': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/recommendations' }),
  },
  'POST /recommendations': {
    allow: ['clinician'],
    ok: 201,
    request: async (f) => ({
      path: '/recommendations',
      body: { squadId: f.squad.id, text: 'Two more landings a session.', dueOn: addDays(7) },
    }),
  },
  'POST /recommendations/:id/status': {
    allow: ['coach'],
    ok: 200,
    request: async (f) => ({
      path: `/recommendations/${(await recommend(f.t.context, f)).id}/status`,
      body: { status: 'accepted' },
    }),
  },
  'GET /clips': {
    allow: readers,
    ok: 200,
    request: async () => ({ path: '/clips' }),
  },
  'POST /clips': {
    allow: ['director', 'coach'],
    ok: 201,
    request: async (f) => ({
      path: `/clips?athleteId=${await athleteInSquad(f)}&elementId=${await anyElement(f)}`,
      body: clipBytes,
    }),
  },
  'GET /clips/:clipId/video': {
    allow: readers,
    ok: 200,
    request: async (f) => ({ path: `/clips/${await uploadedClip(f)}/video` }),
  },
  'POST /clips/:clipId/reviewed': {
    allow: ['clinician'],
    ok: 200,
    request: async (f) => ({ path: `/clips/${await uploadedClip(f)}/reviewed` }),
  },
  'GET /board-summary': {
    allow: ['director', 'board'],
    ok: 200,
    request: async () => ({ path: '/board-summary' }),
  },
  'GET /planner/stations': {
    allow: writers,
    ok: 200,
    request: async () => ({ path: '/planner/stations' }),
  },
  'POST /planner/stations': {
    allow: writers,
    ok: 201,
    request: async () => ({ path: '/planner/stations', body: stationBody() }),
  },
  'PUT /planner/stations/:stationId': {
    allow: writers,
    ok: 200,
    request: async (f) => ({
      path: `/planner/stations/${(await throwawayStation(f)).id}`,
      body: stationBody(),
    }),
  },
  'DELETE /planner/stations/:stationId': {
    allow: writers,
    ok: 204,
    request: async (f) => ({ path: `/planner/stations/${(await throwawayStation(f)).id}` }),
  },
  'POST /planner/plan': {
    allow: writers,
    ok: 200,
    request: async (f) => ({
      path: '/planner/plan',
      body: {
        squadId: f.squad.id,
        athleteIds: [await athleteInSquad(f)],
        minutes: 20,
        blocks: 2,
        coaches: 1,
        stationIds: [(await throwawayStation(f)).id],
        focus: { mode: 'elements', elementIds: [await anyElement(f)] },
      },
    }),
  },
  'GET /plans': { allow: writers, ok: 200, request: async () => ({ path: '/plans' }) },
  'POST /plans': {
    allow: writers,
    ok: 201,
    request: async (f) => ({ path: '/plans', body: await planBody(f) }),
  },
  'GET /plans/:planId': {
    allow: writers,
    ok: 200,
    request: async (f) => ({ path: `/plans/${await throwawayPlan(f)}` }),
  },
  'PUT /plans/:planId': {
    allow: writers,
    ok: 200,
    request: async (f) => ({ path: `/plans/${await throwawayPlan(f)}`, body: await planBody(f) }),
  },
  'POST /plans/:planId/outcome': {
    allow: writers,
    ok: 200,
    request: async (f) => ({
      path: `/plans/${await throwawayPlan(f)}/outcome`,
      body: { occurredOn: addDays(0), passed: [] },
    }),
  },
}

let database: Database
let t: TestApp
let f: Fixture
let agents: Record<Role | 'otherClub', TestAgent>

beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
  const club = await clubWithPeople(database.db, 'matrix')
  const other = await clubWithPeople(database.db, 'elsewhere')
  agents = {
    director: await signedIn(t, club.people.director.email),
    coach: await signedIn(t, club.people.coach.email),
    clinician: await signedIn(t, club.people.clinician.email),
    board: await signedIn(t, club.people.board.email),
    // a director, but of another club
    otherClub: await signedIn(t, other.people.director.email),
  }
  f = { ...club, db: database, director: agents.director, t }
})
afterAll(async () => {
  await t.close()
  await database.close()
})

const send = (
  agent: TestAgent | ReturnType<typeof request>,
  method: string,
  url: string,
  body?: unknown,
) => {
  const call = (agent as TestAgent)[method.toLowerCase() as 'get'](url)
  return body === undefined ? call : call.send(body as object)
}

describe('club API access matrix', () => {
  it('has exactly one row for every club route the server registers', () => {
    const registered = t.clubRoutes.map((r) => `${r.method.toUpperCase()} ${r.path}`).sort()
    expect(Object.keys(matrix).sort()).toEqual(registered)
  })

  const cases = Object.entries(matrix).flatMap(([key, row]) =>
    (['director', 'coach', 'clinician', 'board', 'signed-out', 'otherClub'] as const).map((who) => {
      const expected =
        who === 'signed-out'
          ? 401
          : who === 'otherClub'
            ? 404
            : row.allow.includes(who)
              ? row.ok
              : 403
      return [key, who, expected] as const
    }),
  )

  it.each(cases)('%s as %s answers %i', async (key, who, expected) => {
    const [method, path] = key.split(' ') as [string, string]
    const role = who === 'signed-out' || who === 'otherClub' ? 'director' : who
    const { path: concrete, body, clubId = f.club.id } = await matrix[key]!.request(f, role)
    expect(concrete.split('/').length).toBe(path.split('/').length)
    const url = `/api/clubs/${clubId}${concrete === '/' ? '/' : concrete}`
    const agent = who === 'signed-out' ? request(t.app) : agents[who]
    const res = await send(agent, method, url, body)
    expect(res.status, JSON.stringify(res.body)).toBe(expected)
    if (expected >= 400) expect(res.body.error.code).toBeTypeOf('string')
    if (who === 'otherClub') expect(JSON.stringify(res.body)).not.toContain(f.club.name)
  })

  it('answers 404 for a club id that is not a club at all, and for malformed ids', async () => {
    await agents.director.get(`/api/clubs/${crypto.randomUUID()}/members`).expect(404)
    await agents.director.get('/api/clubs/not-a-uuid/members').expect(404)
  })

  it('answers unknown paths under a club only after the membership check', async () => {
    await request(t.app).get(`/api/clubs/${f.club.id}/no-such-route`).expect(401)
    await agents.otherClub.get(`/api/clubs/${f.club.id}/no-such-route`).expect(404)
    const res = await agents.director.get(`/api/clubs/${f.club.id}/no-such-route`)
    expect(res.status).toBe(404)
    expect(res.body.error.message).toMatch(/No API route/)
  })
})

describe('a clinician reads only the squads their visit covers, only during it', () => {
  // Dates relative to today: yesterday to tomorrow is open; from tomorrow on is not yet.
  it('refuses every club route outside the visit, naming the next visit', async () => {
    const club = await clubWithPeople(database.db, 'later')
    const user = await createUser(database.db, {
      email: 'later-visitor@test.example',
      name: 'Later visitor',
      password: testPassword,
    })
    await addMembership(database.db, { clubId: club.club.id, userId: user.id, role: 'clinician' })
    const director = {
      clubId: club.club.id,
      userId: club.people.director.id,
      role: 'director' as const,
    }
    const body = { firstDay: addDays(2), lastDay: addDays(4), squadIds: [club.squad.id] }
    await createVisit(t.context, director, { clinicianId: user.id, ...body }, 'http://t.test')
    const agent = await signedIn(t, 'later-visitor@test.example')
    const res = await agent.get(`/api/clubs/${club.club.id}/squads`)
    expect(res.status).toBe(403)
    expect(res.body.error.code).toBe('access_window_closed')
    expect(res.body.error.message).toContain(`from ${addDays(2)} to ${addDays(4)}`)
  })

  it('answers 403 for a squad the visit does not cover and lists only the covered ones', async () => {
    const club = await clubWithPeople(database.db, 'covered')
    // Squad B is created after the clinician's visit (which covered every squad then).
    const other = await createSquad(database.db, club.club.id, {
      name: 'Squad B',
      level: 'junior',
      discipline: 'artistic-women',
    })
    const agent = await signedIn(t, club.people.clinician.email)
    const base = `/api/clubs/${club.club.id}`
    const squads = await agent.get(`${base}/squads`).expect(200)
    expect(squads.body.map((s: { name: string }) => s.name)).toEqual(['Squad A'])
    await agent.get(`${base}/squads/${other.id}`).expect(403)
    await agent.get(`${base}/squads/${other.id}/grid`).expect(403)
    const rec = await agent
      .post(`${base}/recommendations`)
      .send({ squadId: other.id, text: 'More handstands.', dueOn: addDays(5) })
    expect(rec.status).toBe(403)
  })

  it('ends access when the director cancels the visit', async () => {
    const club = await clubWithPeople(database.db, 'cancelled')
    const director = {
      clubId: club.club.id,
      userId: club.people.director.id,
      role: 'director' as const,
    }
    const agent = await signedIn(t, club.people.clinician.email)
    await agent.get(`/api/clubs/${club.club.id}/squads`).expect(200)
    const [visit] = await listVisits(database.db, director)
    await cancelVisit(database.db, director, visit!.id)
    const res = await agent.get(`/api/clubs/${club.club.id}/squads`)
    expect(res.status).toBe(403)
    expect(res.body.error.code).toBe('access_window_closed')
  })
})
