// A club's requirement profiles and age thresholds: what the audit's readiness checks read.

import { and, eq } from 'drizzle-orm'
import { defaultAgeThresholds } from '../../shared/domain/age-categories.ts'
import { defaultRequirementProfiles } from '../../shared/domain/audit/readiness.ts'
import type { Discipline } from '../../shared/domain/club.ts'
import type { RequirementProfileInput } from '../../shared/schemas/audits.ts'
import type { ClubAccess } from '../auth/club-access.ts'
import type { DbOrTx } from '../db/client.ts'
import { ageThresholds, requirementProfiles } from '../db/schema-audits.ts'
import { AppError, notFound } from '../http/errors.ts'
import { clubAgeThresholds, clubProfiles } from './audit-inputs.ts'

/** Gives a new club the seeded requirement profiles and age thresholds. */
export async function installAuditDefaults(db: DbOrTx, clubId: string) {
  await db.insert(requirementProfiles).values(
    defaultRequirementProfiles.map((p) => ({
      clubId,
      id: p.id,
      label: p.label,
      discipline: p.discipline,
      apparatus: p.apparatus,
      categories: [...p.categories],
      source: p.source,
      requirements: p.requirements,
    })),
  )
  await db.insert(ageThresholds).values(
    Object.entries(defaultAgeThresholds).map(([discipline, t]) => ({
      clubId,
      discipline: discipline as Discipline,
      juniorFromAge: t.juniorFromAge,
      seniorFromAge: t.seniorFromAge,
      source: t.source,
    })),
  )
}

const profileValues = (input: RequirementProfileInput) => ({
  label: input.label,
  discipline: input.discipline,
  apparatus: input.apparatus,
  categories: input.categories,
  source: input.source,
  requirements: input.requirements,
})
const profileKey = (clubId: string, id: string) =>
  and(eq(requirementProfiles.clubId, clubId), eq(requirementProfiles.id, id))
const noSuchProfile = () => notFound('No such requirement profile in this club.')

/**
 * A new requirement profile. An id the club already uses is refused (409, naming the field)
 * rather than overwritten: two directors creating at once must not lose one of the profiles.
 */
export async function createProfile(
  db: DbOrTx,
  access: ClubAccess,
  input: RequirementProfileInput,
) {
  const inserted = await db
    .insert(requirementProfiles)
    .values({ clubId: access.clubId, id: input.id, ...profileValues(input) })
    .onConflictDoNothing({ target: [requirementProfiles.clubId, requirementProfiles.id] })
    .returning({ id: requirementProfiles.id })
  if (inserted.length === 0) {
    const message = `A requirement profile with the id “${input.id}” already exists in this club.`
    throw new AppError(409, 'profile_exists', message, [{ path: 'id', message }])
  }
  return (await clubProfiles(db, access.clubId)).find((p) => p.id === input.id)!
}

/** Edits a profile that exists; an unknown id is a 404, so an edit never recreates a deleted one. */
export async function saveProfile(db: DbOrTx, access: ClubAccess, input: RequirementProfileInput) {
  const updated = await db
    .update(requirementProfiles)
    .set({ ...profileValues(input), updatedAt: new Date() })
    .where(profileKey(access.clubId, input.id))
    .returning({ id: requirementProfiles.id })
  if (updated.length === 0) throw noSuchProfile()
  return (await clubProfiles(db, access.clubId)).find((p) => p.id === input.id)!
}

/**
 * Deletes a profile. Stored audits are not touched: they hold their readiness results, not a
 * reference to the profile, so they read the same afterwards.
 */
export async function deleteProfile(db: DbOrTx, access: ClubAccess, id: string) {
  const deleted = await db
    .delete(requirementProfiles)
    .where(profileKey(access.clubId, id))
    .returning({ id: requirementProfiles.id })
  if (deleted.length === 0) throw noSuchProfile()
}

export async function saveAgeThresholds(
  db: DbOrTx,
  access: ClubAccess,
  discipline: Discipline,
  input: { juniorFromAge: number; seniorFromAge: number; source: string },
) {
  await db
    .insert(ageThresholds)
    .values({ clubId: access.clubId, discipline, ...input })
    .onConflictDoUpdate({ target: [ageThresholds.clubId, ageThresholds.discipline], set: input })
  return clubAgeThresholds(db, access.clubId)
}
