import { count } from 'drizzle-orm'
import { clubInputSchema, type ClubInput } from '../../shared/schemas/clubs.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs } from '../db/schema.ts'

export async function createClub(db: DbOrTx, input: ClubInput) {
  const values = clubInputSchema.parse(input)
  const [club] = await db.insert(clubs).values(values).returning()
  return club!
}

export async function countClubs(db: DbOrTx) {
  const [row] = await db.select({ n: count() }).from(clubs)
  return row?.n ?? 0
}
