import { randomBytes } from 'node:crypto'
import request from 'supertest'
import type { Role } from '../../shared/domain/club.ts'
import { todayIso } from '../../shared/domain/access.ts'
import type { DbOrTx } from '../../server/db/client.ts'
import { listElements } from '../../server/services/catalogue.ts'
import { createClub } from '../../server/services/clubs.ts'
import { addMembership, createUser } from '../../server/services/members.ts'
import { assignCoach, createSquad } from '../../server/services/squads.ts'
import type { TestApp } from './app.ts'

/** A strong password (zxcvbn score 4) shared by the test people. */
export const testPassword = 'lantern-quarry-velvet-27'

const addDays = (days: number) => todayIso(new Date(Date.now() + days * 86_400_000))

export interface Person {
  id: string
  email: string
  role: Role
}

/** A club with one person in each role (the clinician inside their window) and a squad. */
export async function clubWithPeople(db: DbOrTx, label = randomBytes(4).toString('hex')) {
  const club = await createClub(db, { name: `Test club ${label}`, slug: `test-${label}` })
  const squad = await createSquad(db, club.id, {
    name: 'Squad A',
    level: 'junior',
    discipline: 'artistic-women',
  })
  const people = {} as Record<Role, Person>
  for (const role of ['director', 'coach', 'clinician', 'board'] as const) {
    const email = `${role}-${label}@test.example`
    const user = await createUser(db, { email, name: `${role} ${label}`, password: testPassword })
    const window =
      role === 'clinician' ? { accessStartsOn: addDays(-1), accessEndsOn: addDays(1) } : {}
    await addMembership(db, { clubId: club.id, userId: user.id, role, ...window })
    if (role === 'coach') await assignCoach(db, club.id, squad.id, user.id)
    people[role] = { id: user.id, email, role }
  }
  return { club, squad, people }
}

/** The ids of the standard catalogue's floor back tuck and front tuck, a counterpart pair. */
export async function floorTucks(db: DbOrTx, clubId: string) {
  const catalogue = await listElements(db, clubId)
  const pick = (direction: string) =>
    catalogue.find(
      (e) =>
        e.apparatus === 'floor' &&
        e.direction === direction &&
        e.quarterRotations === 4 &&
        e.twists[0] === 0 &&
        e.shape === 'tuck',
    )!.id
  return { backTuck: pick('backward'), frontTuck: pick('forward') }
}

/** An agent signed in as `email`, sending this site's Origin like a browser would. */
export async function signedIn(t: TestApp, email: string, password = testPassword) {
  const agent = request.agent(t.app)
  const res = await agent.post('/api/auth/sign-in').send({ email, password })
  if (res.status !== 200)
    throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`)
  return agent
}

export { addDays }
