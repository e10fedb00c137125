import { uniformInt } from 'pure-rand/distribution/uniformInt'
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus'
import type { Discipline, Role, SquadLevel } from '../shared/domain/club.ts'
import { previousQuarter, quarterOf } from '../shared/domain/quarters.ts'
import { and, count, eq } from 'drizzle-orm'
import type { ClubAccess } from '../server/auth/club-access.ts'
import type { Db, DbOrTx } from '../server/db/client.ts'
import { memberships } from '../server/db/schema-accounts.ts'
import { athletes } from '../server/db/schema-athletes.ts'
import { elementSteps } from '../server/db/schema-catalogue.ts'
import { createAthlete } from '../server/services/athletes.ts'
import { publish, runAndStore } from '../server/services/audits.ts'
import { listElements } from '../server/services/catalogue.ts'
import { createElement } from '../server/services/catalogue-writes.ts'
import { appendHistory } from '../server/services/progress-history.ts'
import { countClubs, createClub } from '../server/services/clubs.ts'
import { addMembership, createUser } from '../server/services/members.ts'
import { assignCoach, createSquad } from '../server/services/squads.ts'
import type { ClipStore } from '../server/storage/clip-store.ts'
import { demoClubElements } from './demo-elements.ts'
import { demoHistory } from './demo-progress.ts'
import { demoClips } from './demo-clips.ts'
import { demoPastVisit } from './demo-past-visit.ts'
import { demoVisit } from './demo-visits.ts'
import { demoStationsFor } from './demo-stations.ts'
import { familyNames, givenNames } from './names.ts'

/** The one password of every demo sign-in; shown by `npm start` and in the README. */
export const demoPassword = 'twofold-demo-2026'

export const demoClub = { name: 'Northmere Acro & Gymnastics Club', slug: 'northmere' } as const

interface DemoSquad {
  name: string
  level: SquadLevel
  discipline: Discipline
  /** Ages (in the calendar year of the seed) of the squad's athletes. */
  ages: [number, number]
  size: number
}

export const demoSquads: DemoSquad[] = [
  {
    name: 'Fledglings',
    level: 'development',
    discipline: 'artistic-women',
    ages: [8, 10],
    size: 15,
  },
  { name: 'Kites', level: 'intermediate', discipline: 'artistic-women', ages: [10, 12], size: 15 },
  { name: 'Falcons', level: 'junior', discipline: 'artistic-women', ages: [13, 15], size: 16 },
  { name: 'Harriers', level: 'senior', discipline: 'tumbling', ages: [16, 19], size: 14 },
]

interface DemoPerson {
  email: string
  name: string
  role: Role
  /** Names of the squads a coach is assigned to. */
  squads?: string[]
}

export const demoPeople: DemoPerson[] = [
  { email: 'director@demo.example', name: 'Imke Dunhallow', role: 'director' },
  {
    email: 'coach@demo.example',
    name: 'Tomas Redmarsh',
    role: 'coach',
    squads: ['Kites', 'Falcons'],
  },
  { email: 'coach2@demo.example', name: 'Ottilie Kestlow', role: 'coach', squads: ['Fledglings'] },
  {
    email: 'coach3@demo.example',
    name: 'Bastian Foxcote',
    role: 'coach',
    squads: ['Fledglings', 'Kites'],
  },
  {
    email: 'coach4@demo.example',
    name: 'Liv Saltcombe',
    role: 'coach',
    squads: ['Falcons', 'Harriers'],
  },
  { email: 'coach5@demo.example', name: 'Jory Pinemoor', role: 'coach', squads: ['Harriers'] },
  { email: 'clinician@demo.example', name: 'Signe Eskdale', role: 'clinician' },
  { email: 'board@demo.example', name: 'Rune Tarnbrook', role: 'board' },
]

export interface SeedOptions {
  /** The day the demo is seeded as of; ages and the clinician window follow it. */
  today?: Date
  /** Where the demo clips go; without it the demo has no clips. */
  clips?: ClipStore | null
}

const isoDate = (d: Date) => d.toISOString().slice(0, 10)

/**
 * Loads the demo club through the same services the API uses, in one transaction. The same
 * `today` always gives the same club: names and ages come from a fixed pseudo-random seed.
 */
export async function seedDemo(db: Db, options: SeedOptions = {}) {
  const today = options.today ?? new Date()
  const year = today.getUTCFullYear()
  const rng = xoroshiro128plus(20260)
  const pick = <T>(list: readonly T[]) => list[uniformInt(rng, 0, list.length - 1)]!

  return db.transaction(async (tx) => {
    const club = await createClub(tx, demoClub)
    const squadIds = new Map<string, string>()
    for (const squad of demoSquads) {
      const row = await createSquad(tx, club.id, {
        name: squad.name,
        level: squad.level,
        discipline: squad.discipline,
      })
      squadIds.set(squad.name, row.id)
    }

    const taken = new Set<string>()
    let athleteCount = 0
    for (const squad of demoSquads) {
      for (let i = 0; i < squad.size; i++) {
        let givenName: string
        let familyName: string
        do {
          givenName = pick(givenNames)
          familyName = pick(familyNames)
        } while (taken.has(`${givenName} ${familyName}`))
        taken.add(`${givenName} ${familyName}`)
        await createAthlete(tx, club.id, {
          givenName,
          familyName,
          birthYear: year - uniformInt(rng, squad.ages[0], squad.ages[1]),
          squadId: squadIds.get(squad.name)!,
          discipline: squad.discipline,
        })
        athleteCount++
      }
    }

    const userIds = new Map<string, string>()
    for (const person of demoPeople) {
      const user = await createUser(tx, {
        email: person.email,
        name: person.name,
        password: demoPassword,
      })
      userIds.set(person.email, user.id)
      // The clinician's access comes from the demo visit below, covering one squad.
      await addMembership(tx, { clubId: club.id, userId: user.id, role: person.role })
      for (const squadName of person.squads ?? []) {
        await assignCoach(tx, club.id, squadIds.get(squadName)!, user.id)
      }
    }
    const director = await findDirector(tx, club.id)
    for (const element of demoClubElements) {
      await createElement(tx, { clubId: club.id, userId: director, role: 'director' }, element)
    }
    const history = await demoProgress(tx, club.id, today, rng, userIds, squadIds)
    await demoStationsFor(tx, club.id)
    await demoVisit(tx, {
      clubId: club.id,
      today,
      squadId: squadIds.get('Kites')!,
      clinicianId: userIds.get('clinician@demo.example')!,
      directorId: director,
      coachId: userIds.get('coach@demo.example')!,
    })
    await demoPastVisit(tx, {
      clubId: club.id,
      today,
      squadId: squadIds.get('Falcons')!,
      clinicianId: userIds.get('clinician@demo.example')!,
      coachId: userIds.get('coach@demo.example')!,
    })
    if (options.clips)
      await demoClips(tx, options.clips, {
        clubId: club.id,
        squadId: squadIds.get('Kites')!,
        coachId: userIds.get('coach@demo.example')!,
        today,
      })
    const audits = await demoAudits(
      tx,
      { clubId: club.id, userId: director, role: 'director' },
      today,
    )
    return {
      club,
      squads: squadIds.size,
      athletes: athleteCount,
      people: demoPeople.length,
      events: history.events,
      audits,
    }
  })
}

/**
 * The club audited at the end of each of the last four quarters and published, so that the
 * report has a previous audit to compare with and the board a trend to read.
 */
async function demoAudits(db: DbOrTx, director: ClubAccess, today: Date) {
  const quarters: string[] = []
  let quarter = quarterOf(isoDate(today))
  for (let i = 0; i < 4; i++) quarters.unshift((quarter = previousQuarter(quarter)))
  for (const q of quarters) {
    const id = await runAndStore(db, director, { squadId: null, quarter: q })
    await publish(db, director, id)
  }
  return quarters.length
}

/** Seeds the demo only into an empty database, so that a restart never loads it twice. */
export async function seedDemoIfEmpty(db: Db, options: SeedOptions = {}) {
  if ((await countClubs(db)) > 0) return null
  return seedDemo(db, options)
}

async function findDirector(db: DbOrTx, clubId: string) {
  const [row] = await db
    .select({ userId: memberships.userId })
    .from(memberships)
    .where(and(eq(memberships.clubId, clubId), eq(memberships.role, 'director')))
  return row!.userId
}

/** Eighteen months of events for the demo athletes, loaded through the progress service. */
async function demoProgress(
  db: DbOrTx,
  clubId: string,
  today: Date,
  rng: ReturnType<typeof xoroshiro128plus>,
  userIds: Map<string, string>,
  squadIds: Map<string, string>,
) {
  const catalogue = await listElements(db, clubId)
  const counts = await db
    .select({ elementId: elementSteps.elementId, n: count() })
    .from(elementSteps)
    .where(eq(elementSteps.clubId, clubId))
    .groupBy(elementSteps.elementId)
  const stepCount = new Map(counts.map((c) => [c.elementId, c.n]))
  const roster = await db
    .select()
    .from(athletes)
    .where(eq(athletes.clubId, clubId))
    .orderBy(athletes.familyName, athletes.givenName)
  const squadName = new Map([...squadIds].map(([name, id]) => [id, name]))
  const coachOf = (name: string) => {
    const coach = demoPeople.find((p) => p.squads?.includes(name))
    return userIds.get(coach!.email)!
  }
  const history = demoHistory(
    rng,
    today,
    roster.map((a) => ({
      id: a.id,
      squadName: squadName.get(a.squadId)!,
      level: demoSquads.find((s) => s.name === squadName.get(a.squadId))!.level,
    })),
    catalogue.map((e) => ({ ...e, stepCount: stepCount.get(e.id) ?? 1 })),
    coachOf,
  )
  return appendHistory(db, clubId, history)
}
