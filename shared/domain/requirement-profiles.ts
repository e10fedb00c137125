import type { AgeCategory } from './age-categories.ts'
import type { RequirementProfile } from './audit/types.ts'
import type { Discipline } from './club.ts'
import { slugify as slug } from './slug.ts'

/**
 * The apparatus a new profile of a discipline starts on: the artistic disciplines' acrobatic
 * requirements are floor ones; tumbling and trampoline have an apparatus of their own name.
 * Migration 0013 gave profiles written before the field existed the same.
 */
export function defaultApparatus(discipline: Discipline): string {
  return discipline === 'tumbling' || discipline === 'trampoline' ? discipline : 'floor'
}

/** The longest id the API accepts for a requirement profile. */
export const profileIdMaxLength = 60

/**
 * The id of a new requirement profile, derived from its name: lower-case letters, digits and
 * dashes, at most 60 characters, with "-2", "-3"… added when the club already uses it. A name
 * with nothing to keep (only punctuation, or a script without Latin letters) gives "profile".
 */
export function profileIdFromLabel(label: string, takenIds: Iterable<string>): string {
  const taken = new Set(takenIds)
  const base = slug(label, profileIdMaxLength) || 'profile'
  if (!taken.has(base)) return base
  for (let n = 2; ; n++) {
    const suffix = `-${n}`
    const stem = base.slice(0, profileIdMaxLength - suffix.length).replace(/-+$/, '')
    if (!taken.has(`${stem}${suffix}`)) return `${stem}${suffix}`
  }
}

/**
 * The profiles other than `except` that apply to the same discipline and to at least one of the
 * same categories. The readiness check reads a single profile per discipline and category, so
 * of two overlapping profiles one is not used for the categories they share.
 */
export function overlappingProfiles(
  profiles: readonly RequirementProfile[],
  discipline: Discipline,
  categories: readonly AgeCategory[],
  except?: string,
): { profile: RequirementProfile; categories: AgeCategory[] }[] {
  return profiles.flatMap((profile) => {
    if (profile.id === except || profile.discipline !== discipline) return []
    const shared = categories.filter((c) => profile.categories.includes(c))
    return shared.length > 0 ? [{ profile, categories: shared }] : []
  })
}
