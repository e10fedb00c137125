import { describe, expect, it } from 'vitest'
import { deriveElement } from '../../shared/domain/catalogue.ts'
import { elementInputSchema, elementSchema } from '../../shared/schemas/elements.ts'

const fullIn = {
  name: 'Full-in back tuck',
  apparatus: 'floor',
  direction: 'backward',
  quarterRotations: 8,
  twists: [2, 0],
  shape: 'tuck',
  takeOff: 'round-off',
  difficultyLetter: 'E',
} as const

describe('element input', () => {
  it('accepts a complete element and trims the name', () => {
    const parsed = elementInputSchema.parse({ ...fullIn, name: '  Full-in back tuck  ' })
    expect(parsed).toEqual({ ...fullIn, twists: [2, 0] })
  })

  it('accepts a handspring with no twists and no shape', () => {
    const handspring = {
      name: 'Back handspring',
      apparatus: 'tumbling',
      direction: 'backward',
      quarterRotations: 0,
      twists: [],
      shape: null,
      takeOff: 'round-off',
    }
    expect(elementInputSchema.safeParse(handspring).success).toBe(true)
  })

  it('accepts an apparatus the club added itself', () => {
    const parsed = elementInputSchema.safeParse({
      ...fullIn,
      apparatus: 'double-mini',
      difficultyLetter: undefined,
    })
    expect(parsed.success).toBe(true)
  })

  it.each([
    ['name', { name: '   ' }, 'Enter the element name.'],
    ['name', { name: 'x'.repeat(81) }, 'Keep the element name to 80 characters or fewer.'],
    [
      'apparatus',
      { apparatus: 'Floor' },
      'Write the apparatus in lower-case letters, digits and dashes, e.g. floor or double-mini.',
    ],
    ['apparatus', { apparatus: '' }, 'Choose the apparatus.'],
    [
      'direction',
      { direction: 'upward' },
      'Choose the direction of the salto: forward, backward or sideward.',
    ],
    [
      'quarterRotations',
      { quarterRotations: 17 },
      'The rotation can be at most 16 quarter saltos (a quadruple salto).',
    ],
    [
      'quarterRotations',
      { quarterRotations: 7.5 },
      'Enter the rotation as a whole number of quarter saltos (4 = single, 8 = double).',
    ],
    [
      'quarterRotations',
      { quarterRotations: -4 },
      'The rotation cannot be negative; use 0 for a handspring or walkover.',
    ],
    ['twists', { twists: [2] }, 'A double salto needs 2 twist entries, one per salto (got 1).'],
    [
      'twists',
      { quarterRotations: 4, twists: [] },
      'A single salto needs 1 twist entry, one per salto (got 0).',
    ],
    [
      'twists',
      { quarterRotations: 12, twists: [0, 0] },
      'A triple salto needs 3 twist entries, one per salto (got 2).',
    ],
    [
      'twists',
      { quarterRotations: 0, twists: [1], shape: null, difficultyLetter: undefined },
      'An element without a salto has no twist entries, since twist is counted per salto (got 1).',
    ],
    ['shape', { shape: null }, 'A double salto needs a body shape: tuck, pike or straight.'],
    [
      'shape',
      { quarterRotations: 0, twists: [], shape: 'tuck', difficultyLetter: undefined },
      'An element without a salto (handspring, walkover) has no body shape; leave it empty.',
    ],
    ['shape', { shape: 'layout' }, 'Choose the body shape: tuck, pike or straight.'],
    ['takeOff', { takeOff: 'cartwheel' }, 'Choose the take-off.'],
    [
      'difficultyLetter',
      { apparatus: 'trampoline' },
      'The difficulty letter is only for artistic apparatus (floor); on trampoline the difficulty follows from the rotation and twist.',
    ],
    ['difficultyLetter', { difficultyLetter: 'K' }, 'The difficulty letter must be one of A to J.'],
    ['notes', { notes: 'x'.repeat(2001) }, 'Keep the notes to 2000 characters or fewer.'],
  ])('refuses a wrong %s, naming the field in its message', (field, change, message) => {
    const result = elementInputSchema.safeParse({ ...fullIn, ...change })
    expect(result.success).toBe(false)
    expect(result.error?.issues).toHaveLength(1)
    const issue = result.error?.issues[0]
    expect(issue?.path).toEqual([field])
    expect(issue?.message).toBe(message)
  })

  it('puts the twist-entry message on the offending entry for a twist out of range', () => {
    const result = elementInputSchema.safeParse({ ...fullIn, twists: [9, 0] })
    expect(result.error?.issues[0]?.path).toEqual(['twists', 0])
    expect(result.error?.issues[0]?.message).toBe(
      'The twist in one salto can be at most 8 half turns (4 twists).',
    )
  })

  it('reports every cross-field refusal at once', () => {
    const result = elementInputSchema.safeParse({
      ...fullIn,
      apparatus: 'tumbling',
      twists: [2],
      shape: null,
    })
    expect(result.error?.issues.map((issue) => issue.path[0])).toEqual([
      'twists',
      'shape',
      'difficultyLetter',
    ])
  })
})

describe('element answer', () => {
  const answer = {
    ...fullIn,
    id: '0b6f1a43-3c55-4d0e-9b43-9c1f7d1c2a10',
    clubId: '6f1c1c1e-8a53-4c1b-9f3e-0a3a4f1f7b21',
    ...deriveElement(fullIn),
    counterpartId: null,
  }

  it('accepts an element with its derived fields', () => {
    const parsed = elementSchema.parse(answer)
    expect(parsed.notation).toBe('820o')
    expect(parsed.difficultyValue).toBe(0.5)
    expect(parsed.rotationClass).toBe('double')
  })

  it('refuses an answer whose counterpart id is not a uuid', () => {
    const result = elementSchema.safeParse({ ...answer, counterpartId: 'front-full-in' })
    expect(result.error?.issues[0]?.path).toEqual(['counterpartId'])
  })
})
