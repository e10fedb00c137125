import type { AppContext } from '../../server/context.ts'
import type { DbOrTx } from '../../server/db/client.ts'
import { addMembership, createUser } from '../../server/services/members.ts'
import { createRecommendation } from '../../server/services/recommendations.ts'
import { assignCoach, createSquad } from '../../server/services/squads.ts'
import { createVisit } from '../../server/services/visits.ts'
import type { RecommendationInput } from '../../shared/schemas/visits.ts'
import type { Person } from './fixtures.ts'
import { addDays, testPassword } from './fixtures.ts'

interface Club {
  club: { id: string }
  squad: { id: string }
  people: Record<'director' | 'clinician', Person>
}

const as = (club: Club, who: 'director' | 'clinician') => ({
  clubId: club.club.id,
  userId: club.people[who].id,
  role: who,
})

/** A visit of the fixture's clinician covering the squad, open from yesterday to tomorrow. */
export const scheduleVisit = (ctx: AppContext, club: Club, squadIds = [club.squad.id]) =>
  createVisit(
    ctx,
    as(club, 'director'),
    {
      clinicianId: club.people.clinician.id,
      firstDay: addDays(-1),
      lastDay: addDays(1),
      squadIds,
      agenda: 'Review the squads',
    },
    'http://twofold.test',
  )

/** A recommendation on the squad by the fixture's clinician, due in ten days. */
export const recommend = (ctx: AppContext, club: Club, input: Partial<RecommendationInput> = {}) =>
  createRecommendation(ctx, as(club, 'clinician'), {
    squadId: club.squad.id,
    text: 'Add a forward roll station to every session.',
    dueOn: addDays(10),
    ...input,
  })

/** A second squad, "Squad B", and a coach of it alone signing in as `email`. */
export async function squadBWithCoach(db: DbOrTx, clubId: string, email: string) {
  const squad = await createSquad(db, clubId, {
    name: 'Squad B',
    level: 'junior',
    discipline: 'artistic-women',
  })
  const user = await createUser(db, { email, name: 'Coach B', password: testPassword })
  await addMembership(db, { clubId, userId: user.id, role: 'coach' })
  await assignCoach(db, clubId, squad.id, user.id)
  return squad
}

export type { DbOrTx }
