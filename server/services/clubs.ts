import { count, like } from 'drizzle-orm'
import { clubSlugFromName, clubSlugMaxLength, slugify } from '../../shared/domain/slug.ts'
import { clubInputSchema, type ClubInput } from '../../shared/schemas/clubs.ts'
import type { DbOrTx } from '../db/client.ts'
import { clubs } from '../db/schema-accounts.ts'
import { installAuditDefaults } from './audit-profiles.ts'
import { installStandardCatalogue } from './catalogue-templates.ts'

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

/** True for PostgreSQL's unique violation on `constraint`, bare or wrapped by Drizzle. */
function violates(err: unknown, constraint: string): boolean {
  for (let e = err; e instanceof Error; e = e.cause) {
    const pgError = e as Error & { code?: string; constraint?: string }
    if (pgError.code === '23505' && pgError.constraint === constraint) return true
  }
  return false
}

/**
 * A new club (as `createClub`) under a slug derived from its name, with "-2", "-3"… added when
 * it is taken. Two clubs of the same name created at once both get one: the loser of the race
 * on the unique slug tries the next free one (`createClub` runs in a savepoint, so the caller's
 * transaction goes on).
 */
export async function createClubNamed(db: DbOrTx, name: string) {
  // Every candidate starts with this much of the base, even with a long suffix cut into it.
  const prefix = (slugify(name, clubSlugMaxLength) || 'club').slice(0, clubSlugMaxLength - 10)
  for (let attempt = 0; ; attempt++) {
    const taken = await db
      .select({ slug: clubs.slug })
      .from(clubs)
      .where(like(clubs.slug, `${prefix}%`))
    const slug = clubSlugFromName(
      name,
      taken.map((r) => r.slug),
    )
    try {
      return await createClub(db, { name, slug })
    } catch (err) {
      if (attempt >= 4 || !violates(err, 'clubs_slug_unique')) throw err
    }
  }
}

export async function countClubs(db: DbOrTx) {
  const [row] = await db.select({ n: count() }).from(clubs)
  return row?.n ?? 0
}
