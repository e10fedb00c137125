import { athleteInputSchema, type AthleteInput } from '../../shared/schemas/athletes.ts'
import type { DbOrTx } from '../db/client.ts'
import { athletes } from '../db/schema.ts'

export async function createAthlete(db: DbOrTx, clubId: string, input: AthleteInput) {
  const values = athleteInputSchema.parse(input)
  const [athlete] = await db
    .insert(athletes)
    .values({ ...values, clubId })
    .returning()
  return athlete!
}
