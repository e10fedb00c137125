import type { AppContext } from '../../server/context.ts'
import type { DbOrTx } from '../../server/db/client.ts'
import { createRecommendation } from '../../server/services/recommendations.ts'
import { createVisit } from '../../server/services/visits.ts'
import type { RecommendationInput } from '../../shared/schemas/visits.ts'
import type { Person } from './fixtures.ts'
import { addDays } from './fixtures.ts'

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

export type { DbOrTx }
