import { describe, expect, it } from 'vitest'
import { clubSlugFromName } from '../../shared/domain/slug.ts'
import { clubInputSchema } from '../../shared/schemas/clubs.ts'

// Club slugs: common practice (no published source) for URL slugs, kept to what a club's slug
// may be (lower-case letters, digits and dashes, at most 60 characters, unique).

const long = `${'a'.repeat(58)} b c`

describe('clubSlugFromName', () => {
  it.each<[string, string[], string]>([
    ['Lowfield Tumbling Club', [], 'lowfield-tumbling-club'],
    ["St Brigid's Acro", [], 'st-brigids-acro'],
    ['Étoile Gymnastique Süd', [], 'etoile-gymnastique-sud'],
    ['  --Harbour & Dune 2026--  ', [], 'harbour-dune-2026'],
    ['!!!', [], 'club'],
    ['体操クラブ', ['club'], 'club-2'],
    ['Lowfield', ['lowfield'], 'lowfield-2'],
    ['Lowfield', ['lowfield', 'lowfield-2', 'lowfield-3'], 'lowfield-4'],
    [long, [], `${'a'.repeat(58)}-b`],
    [long, [`${'a'.repeat(58)}-b`], `${'a'.repeat(58)}-2`],
  ])('"%s" with %j taken gives "%s"', (name, taken, slug) => {
    expect(clubSlugFromName(name, taken)).toBe(slug)
  })

  it('always gives a slug a club may have', () => {
    for (const name of ['A', long, '---', 'Ÿ'.repeat(200), "O'Neill's", 'Club 9'])
      for (const taken of [[], [clubSlugFromName(name, [])]]) {
        const slug = clubSlugFromName(name, taken)
        expect(clubInputSchema.shape.slug.safeParse(slug).success).toBe(true)
        expect(taken).not.toContain(slug)
      }
  })
})
