import { randomUUID } from 'node:crypto'
import type { Database } from '../../server/db/client.ts'
import { createAthlete } from '../../server/services/athletes.ts'
import { createProfile } from '../../server/services/audit-profiles.ts'
import { submitAuditRun } from '../../server/services/audit-runs.ts'
import { runAndStore } from '../../server/services/audits.ts'
import { createElement } from '../../server/services/catalogue-writes.ts'
import { submitClubArchive } from '../../server/services/club-archives.ts'
import { addMembership, createUser } from '../../server/services/members.ts'
import { createStation } from '../../server/services/planner.ts'
import { savePlan } from '../../server/services/planner-plans.ts'
import { submitReportPdf } from '../../server/services/report-pdfs.ts'
import { requirementProfileSchema } from '../../shared/schemas/audits.ts'
import type { TestApp } from './app.ts'
import { addDays, clubWithPeople, floorTucks, signedIn, testPassword } from './fixtures.ts'
import { recommend, scheduleVisit } from './visits.ts'
import { doubleSaltoProfile } from './profiles.ts'

// A club with one of everything, the valid request of each route that takes a body or reads a
// query, and the value of each path parameter: the sweep spoils one part of these at a time.

/** A valid request of a route: the body it takes, the query it reads. */
export interface BaseRequest {
  body?: unknown
  /** Every field of the body may be left out: `{}` is a valid body. */
  emptyIsValid?: boolean
  /** Top-level fields holding a copy kept as it was (a plan's model): see `bodyCases`. */
  copies?: string[]
  /** The body is a file's bytes, not JSON: it is only replaced as a whole. */
  fileBody?: boolean
  query?: Record<string, string>
}

const elementBody = (apparatus: string) => ({
  name: `Sweep element ${apparatus}`,
  apparatus,
  direction: 'sideward',
  quarterRotations: 4,
  twists: [0],
  shape: 'tuck',
  takeOff: 'standing',
})
const oneStep = [{ name: 'Competition-ready', modality: 'routine', criterion: 'Twice.' }]
const profile = doubleSaltoProfile('Sweep profile')
const station = (name: string) => ({
  name,
  modality: 'trampoline',
  capacity: 2,
  secondsPerTurn: 30,
  needsSpotter: false,
})

/** The club, one of each thing its routes act on, and the valid requests built on them. */
export async function sweepClub(t: TestApp, database: Database) {
  const db = database.db
  const base = await clubWithPeople(db, 'sweep')
  const { club, squad, people } = base
  const access = { clubId: club.id, userId: people.director.id, role: 'director' as const }
  const director = await signedIn(t, people.director.email)
  const member = await createUser(db, {
    email: 'member-sweep@test.example',
    name: 'Member',
    password: testPassword,
  })
  await addMembership(db, { clubId: club.id, userId: member.id, role: 'coach' })
  const element = await createElement(db, access, elementBody('custom-sweep'))
  const anyElement = (await floorTucks(db, club.id)).backTuck
  const athlete = await createAthlete(db, club.id, {
    givenName: 'Sweep',
    familyName: 'Athlete',
    birthYear: 2012,
    squadId: squad.id,
    discipline: 'artistic-women',
  })
  const invitation = await director
    .post(`/api/clubs/${club.id}/invitations`)
    .send({ email: 'invited-sweep@test.example', role: 'board' })
  const auditId = await runAndStore(db, access, { squadId: null })
  const job = await submitAuditRun(db, t.context.jobs, access, { squadId: null })
  const pdf = await submitReportPdf(db, t.context.jobs, access, auditId)
  const archive = await submitClubArchive(db, t.context.jobs, access)
  const input = requirementProfileSchema.parse({ ...profile, id: 'sweep-profile' })
  const profileId = (await createProfile(db, access, input)).id
  const visit = await scheduleVisit(t.context, base)
  const recommendation = await recommend(t.context, base)
  const stationRow = await createStation(db, club.id, station('Sweep station'))
  const clipBytes = Buffer.concat([Buffer.from([0x1a, 0x45, 0xdf, 0xa3]), Buffer.alloc(60, 2)])
  const clip = await director
    .post(`/api/clubs/${club.id}/clips`)
    .query({ athleteId: athlete.id, elementId: anyElement })
    .send(clipBytes)
  const planBody = {
    squadId: squad.id,
    sessionDate: addDays(0),
    model: {
      minutes: 20,
      blocks: 2,
      changeoverSeconds: 60,
      coaches: 1,
      stations: [stationRow],
      athletes: [{ id: athlete.id, name: 'Sweep athlete', options: [] }],
    },
    placements: [],
  }
  const plan = await savePlan(db, access, planBody)

  /** Path parameter values, by `segment/:name` (the segment before the parameter). */
  const params: Record<string, string> = {
    'clubs/:clubId': club.id,
    'members/:userId': member.id,
    'invitations/:id': invitation.body.id,
    'elements/:id': element.id,
    'progression-templates/:family': 'single-salto',
    'squads/:squadId': squad.id,
    'athletes/:athleteId': athlete.id,
    'records/:elementId': anyElement,
    'audit-jobs/:jobId': job.id,
    'audits/:id': auditId,
    'report-pdfs/:id': pdf.id,
    'requirement-profiles/:id': profileId,
    'age-thresholds/:discipline': 'tumbling',
    'archives/:id': archive.id,
    'visits/:visitId': visit.id,
    'recommendations/:id': recommendation.id,
    'clips/:clipId': clip.body.id,
    'stations/:stationId': stationRow.id,
    'plans/:planId': plan.id,
    'sessions/:handle': '0123456789abcdef01234567',
  }
  const paramValue = (name: string, owner: string) => params[`${owner}/:${name}`] ?? randomUUID()

  const stepEvent = {
    elementId: anyElement,
    kind: 'step',
    stepIndex: 0,
    occurredOn: '2026-11-01',
    expectedLastEventId: null,
  }
  const token = 'a'.repeat(43)
  /** The valid request of each route that takes a body or reads a query; `{}` takes neither. */
  const requests: Record<string, BaseRequest> = {
    'DELETE /': { body: { confirmName: club.name } },
    'PATCH /settings': { body: { lostSkillStepDown: 2 } },
    'PATCH /members/:userId': { body: { role: 'board' } },
    'DELETE /members/:userId': {},
    'POST /invitations': { body: { email: 'new-sweep@test.example', role: 'coach' } },
    'POST /invitations/:id/resend': {},
    'DELETE /invitations/:id': {},
    'GET /elements': { query: { apparatus: 'floor', direction: 'backward', q: 'tuck' } },
    'POST /elements': { body: elementBody('custom-new') },
    'POST /elements/import': {
      body: {
        dryRun: false,
        rows: [{ ...elementBody('custom-csv'), twists: '0', quarterRotations: '4' }],
      },
    },
    'PATCH /elements/:id': { body: elementBody('custom-sweep') },
    'DELETE /elements/:id': {},
    'PUT /elements/:id/steps': { body: { steps: oneStep, stepsVersion: 1 } },
    'PUT /elements/:id/prerequisites': {
      body: { prerequisites: [{ elementId: anyElement, stepIndex: 0 }] },
    },
    'PUT /progression-templates/:family': { body: { steps: oneStep } },
    'POST /squads': { body: { name: 'Squad S', level: 'junior', discipline: 'tumbling' } },
    'PATCH /squads/:squadId': {
      body: { name: 'Squad A', level: 'junior', discipline: 'artistic-women' },
    },
    'PUT /squads/:squadId/coaches': { body: { userIds: [people.coach.id] } },
    'GET /squads/:squadId/grid': { query: { apparatus: 'floor', rotationClass: 'single' } },
    'GET /athletes': { query: { squadId: squad.id, includeArchived: 'true' } },
    'GET /athletes/export': { query: { squadId: squad.id } },
    'POST /athletes': {
      body: {
        givenName: 'New',
        familyName: 'Sweep',
        birthYear: 2013,
        squadId: squad.id,
        discipline: 'artistic-women',
      },
    },
    'POST /athletes/import': {
      body: {
        dryRun: false,
        rows: [{ givenName: 'Row', familyName: 'Sweep', birthYear: '2012', squad: 'Squad A' }],
      },
    },
    'PATCH /athletes/:athleteId': { body: { givenName: 'Renamed', birthYear: 2012 } },
    'POST /athletes/:athleteId/erase': { body: { confirmName: 'Sweep Athlete' } },
    'POST /athletes/:athleteId/events/check': { body: stepEvent },
    'POST /athletes/:athleteId/events': { body: stepEvent },
    'GET /squads/:squadId/progress-batch': {
      query: { elementId: anyElement, counterpartId: element.id, occurredOn: '2026-11-01' },
    },
    'POST /squads/:squadId/progress-batch': {
      body: {
        elementId: anyElement,
        occurredOn: '2026-11-01',
        entries: [{ athleteId: athlete.id, elementId: anyElement, expectedLastEventId: null }],
      },
    },
    'GET /progress-due': { query: { days: '14' } },
    'POST /audits': { body: { squadId: squad.id }, emptyIsValid: true },
    'POST /audits/:id/recheck': {},
    'POST /audits/:id/publish': {},
    'POST /audits/:id/report-pdfs': {},
    'POST /requirement-profiles': { body: { ...profile, id: 'sweep-new' } },
    'PUT /requirement-profiles/:id': { body: profile },
    'DELETE /requirement-profiles/:id': {},
    'PUT /age-thresholds/:discipline': {
      body: { juniorFromAge: 13, seniorFromAge: 17, source: 'from memory' },
    },
    'POST /archives': {},
    'POST /visits': {
      body: {
        clinicianId: people.clinician.id,
        firstDay: addDays(1),
        lastDay: addDays(3),
        squadIds: [squad.id],
      },
    },
    'PATCH /visits/:visitId': {
      body: { agenda: 'Vault first', lastDay: addDays(2) },
      emptyIsValid: true,
    },
    'POST /visits/:visitId/cancel': {},
    'GET /recommendations': { query: { squadId: squad.id, open: 'true' } },
    'POST /recommendations': {
      body: { squadId: squad.id, text: 'Two more landings.', dueOn: addDays(7) },
    },
    'POST /recommendations/:id/status': { body: { status: 'accepted' } },
    'GET /clips': { query: { athleteId: athlete.id, elementId: anyElement, unreviewed: 'true' } },
    'POST /clips': {
      query: { athleteId: athlete.id, elementId: anyElement, note: 'Landing' },
      fileBody: true,
    },
    'POST /clips/:clipId/reviewed': {},
    'POST /planner/stations': { body: station('New station') },
    'PUT /planner/stations/:stationId': { body: station('Sweep station') },
    'DELETE /planner/stations/:stationId': {},
    'POST /planner/plan': {
      body: {
        squadId: squad.id,
        athleteIds: [athlete.id],
        minutes: 20,
        blocks: 2,
        coaches: 1,
        stationIds: [stationRow.id],
        focus: { mode: 'elements', elementIds: [anyElement] },
      },
    },
    'GET /plans': { query: { squadId: squad.id } },
    'POST /plans': { body: planBody, copies: ['model'] },
    'PUT /plans/:planId': { body: planBody, copies: ['model'] },
    'POST /plans/:planId/outcome': {
      body: { occurredOn: addDays(0), passed: [{ athleteId: athlete.id, elementId: anyElement }] },
    },
    // Outside a club.
    'POST /auth/sign-in': { body: { email: 'nobody@test.example', password: testPassword } },
    'POST /auth/sign-out': {},
    'POST /auth/club': { body: { clubId: club.id } },
    'DELETE /auth/sessions/:handle': {},
    'POST /auth/sessions/end-others': {},
    'POST /auth/password': { body: { currentPassword: 'wrong', newPassword: testPassword } },
    'POST /auth/password-reset/request': { body: { email: 'nobody@test.example' } },
    'POST /auth/password-reset/confirm': { body: { token, newPassword: testPassword } },
    'POST /auth/invitations/preview': { body: { token } },
    'POST /auth/invitations/accept': { body: { token, name: 'New', password: testPassword } },
    'POST /signup/request': {
      body: { clubName: 'Sweep club', name: 'New', email: 'nobody@test.example' },
    },
    'POST /signup/preview': { body: { token } },
    'POST /signup/confirm': { body: { token, password: testPassword } },
  }
  return { ...base, director, paramValue, requests }
}
