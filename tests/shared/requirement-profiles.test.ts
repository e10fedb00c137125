import { describe, expect, it } from 'vitest'
import { womensArtisticFloorProfile } from '../../shared/domain/audit/readiness.ts'
import type { RequirementProfile } from '../../shared/domain/audit/types.ts'
import {
  defaultApparatus,
  overlappingProfiles,
  profileIdFromLabel,
} from '../../shared/domain/requirement-profiles.ts'
import { requirementProfileSchema } from '../../shared/schemas/audits.ts'

// Ids of new profiles: common practice (no published source) for URL slugs, kept to what the API
// accepts (lower-case letters, digits and dashes, at most 60 characters).

const long = `${'a'.repeat(58)} b c`

describe('profileIdFromLabel', () => {
  it.each<[string, string[], string]>([
    ['Tumbling: junior passes', [], 'tumbling-junior-passes'],
    ["Women's artistic floor", [], 'womens-artistic-floor'],
    ['Bänder – Übersprünge', [], 'bander-ubersprunge'],
    ['  --Senior 2027--  ', [], 'senior-2027'],
    ['!!!', [], 'profile'],
    ['体操', ['profile'], 'profile-2'],
    ['Tumbling', ['tumbling'], 'tumbling-2'],
    ['Tumbling', ['tumbling', 'tumbling-2', 'tumbling-3'], 'tumbling-4'],
    [long, [], `${'a'.repeat(58)}-b`],
    [long, [`${'a'.repeat(58)}-b`], `${'a'.repeat(58)}-2`],
  ])('"%s" with %j taken gives "%s"', (label, taken, id) => {
    expect(profileIdFromLabel(label, taken)).toBe(id)
  })

  it('always gives an id the API accepts', () => {
    for (const label of ['Tumbling', long, '!!!', "Men's artistic — senior", 'x'.repeat(200)]) {
      const id = profileIdFromLabel(label, [])
      expect(requirementProfileSchema.shape.id.safeParse(id).success, id).toBe(true)
    }
  })
})

describe('defaultApparatus', () => {
  it.each([
    // The acrobatic composition requirements of the artistic disciplines are floor ones (FIG WAG
    // and MAG Codes of Points, floor exercise, from memory); tumbling and trampoline are each
    // their own apparatus (FIG Trampoline Code of Points, from memory).
    ['artistic-women', 'floor'],
    ['artistic-men', 'floor'],
    ['tumbling', 'tumbling'],
    ['trampoline', 'trampoline'],
  ] as const)('starts a %s profile on %s', (discipline, apparatus) => {
    expect(defaultApparatus(discipline)).toBe(apparatus)
  })
})

describe('overlappingProfiles', () => {
  const tumbling: RequirementProfile = {
    ...womensArtisticFloorProfile,
    id: 'tumbling-senior',
    discipline: 'tumbling',
    categories: ['senior'],
  }
  const profiles = [womensArtisticFloorProfile, tumbling]

  it.each<[string, Parameters<typeof overlappingProfiles>, [string, string[]][]]>([
    [
      'same discipline, one shared category',
      [profiles, 'artistic-women', ['junior']],
      [[womensArtisticFloorProfile.id, ['junior']]],
    ],
    [
      'same discipline, both categories shared',
      [profiles, 'artistic-women', ['junior', 'senior']],
      [[womensArtisticFloorProfile.id, ['junior', 'senior']]],
    ],
    ['another discipline', [profiles, 'trampoline', ['junior', 'senior']], []],
    ['same discipline, no shared category', [profiles, 'tumbling', ['junior']], []],
    ['the profile itself', [profiles, 'tumbling', ['senior'], 'tumbling-senior'], []],
  ])('%s', (_case, args, expected) => {
    expect(overlappingProfiles(...args).map((o) => [o.profile.id, o.categories])).toEqual(expected)
  })
})
