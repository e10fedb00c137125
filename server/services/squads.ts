import { squadInputSchema, type SquadInput } from '../../shared/schemas/squads.ts'
import type { DbOrTx } from '../db/client.ts'
import { coachSquads, squads } from '../db/schema.ts'

export async function createSquad(db: DbOrTx, clubId: string, input: SquadInput) {
  const values = squadInputSchema.parse(input)
  const [squad] = await db
    .insert(squads)
    .values({ ...values, clubId })
    .returning()
  return squad!
}

/** Gives a coach (already a member of the club) access to a squad. */
export async function assignCoach(db: DbOrTx, clubId: string, squadId: string, userId: string) {
  await db.insert(coachSquads).values({ clubId, squadId, userId }).onConflictDoNothing()
}
