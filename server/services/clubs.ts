import { count } from 'drizzle-orm'
import { clubInputSchema, type ClubInput } from '../../shared/schemas/clubs.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs } from '../db/schema.ts'
import { installAuditDefaults } from './audits.ts'
import { installStandardCatalogue } from './catalogue.ts'

/** A new club, starting from the standard catalogue and progression templates. */
export async function createClub(db: DbOrTx, input: ClubInput) {
  const values = clubInputSchema.parse(input)
  return db.transaction(async (tx) => {
    const [club] = await tx.insert(clubs).values(values).returning()
    await installStandardCatalogue(tx, club!.id)
    await installAuditDefaults(tx, club!.id)
    return club!
  })
}

export async function countClubs(db: DbOrTx) {
  const [row] = await db.select({ n: count() }).from(clubs)
  return row?.n ?? 0
}
