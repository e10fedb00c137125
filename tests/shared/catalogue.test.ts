import { describe, expect, it } from 'vitest'
import {
  catalogueGaps,
  counterpartKey,
  deriveElement,
  descriptionKey,
  difficultyValue,
  figNotation,
  findCounterparts,
  findPrerequisiteCycle,
  rotationClass,
  saltoCount,
  totalHalfTwists,
  trampolineDifficulty,
  trampolineDifficultyEdition,
  twistBand,
  type ElementDescription,
} from '../../shared/domain/catalogue.ts'
import type { Direction, Shape } from '../../shared/domain/element.ts'

function element(
  direction: Direction,
  quarterRotations: number,
  twists: number[],
  shape: Shape | null,
  apparatus = 'trampoline',
  name = 'Element',
): ElementDescription {
  return { name, apparatus, direction, quarterRotations, twists, shape }
}

describe('saltoCount, rotationClass and twistBand', () => {
  it.each([
    // Salto count (twist entries), Twofold's rule (product brief): a partial salto counts as the
    // salto being worked on. Rotation class, by saltos completed: in the FIG numeric notation the
    // first figure counts quarter saltos and a double salto is 8 (820o, the full-in double back,
    // FIG Trampoline Code of Points 2005, appendix A), and the same code's difficulty adds 0.1
    // only per completed salto; so a 1¼ salto (5 quarters) is of the single class, not a double.
    [0, 0, 'none'],
    [1, 1, 'single'],
    [3, 1, 'single'], // ¾ salto: short of a full rotation, still a salto
    [4, 1, 'single'],
    [5, 2, 'single'], // 1¼ salto: one salto completed
    [7, 2, 'single'], // 1¾ salto
    [8, 2, 'double'], // the first double: 8 quarters
    [9, 3, 'double'], // 2¼
    [11, 3, 'double'], // 2¾
    [12, 3, 'triple'], // the first triple: 12 quarters
    [16, 4, 'triple'], // quadruple, sharing the triple class
  ] as const)(
    'counts %i quarter rotations as %i saltos, class %s',
    (quarters, saltos, rotation) => {
      expect(saltoCount(quarters)).toBe(saltos)
      expect(rotationClass(quarters)).toBe(rotation)
    },
  )

  it.each([
    // Twofold's rule (product brief): total twist in half turns, banded for the coverage grid
    [[], 0, 'none'],
    [[0, 0], 0, 'none'],
    [[1], 1, 'half'],
    [[0, 1], 1, 'half'],
    [[2], 2, 'full'],
    [[1, 1], 2, 'full'],
    [[3], 3, 'more'],
    [[2, 2], 4, 'more'],
    [[0, 0, 1], 1, 'half'],
  ] as const)('sums twists %j to %i half turns, band %s', (twists, total, band) => {
    expect(totalHalfTwists(twists)).toBe(total)
    expect(twistBand(total)).toBe(band)
  })
})

describe('figNotation', () => {
  it.each([
    // FIG trampoline numeric notation: quarter saltos, half twists per salto, shape symbol
    ['back tuck', element('backward', 4, [0], 'tuck'), '40o'],
    ['back pike', element('backward', 4, [0], 'pike'), '40<'],
    ['barani (straight)', element('forward', 4, [1], 'straight'), '41/'],
    ['barani (pike)', element('forward', 4, [1], 'pike'), '41<'],
    ['full twisting back', element('backward', 4, [2], 'straight'), '42/'],
    ['double back tuck', element('backward', 8, [0, 0], 'tuck'), '800o'],
    ['half-out double back tuck', element('backward', 8, [0, 1], 'tuck'), '801o'],
    ['full-in double back tuck', element('backward', 8, [2, 0], 'tuck'), '820o'],
    ['triple back tuck', element('backward', 12, [0, 0, 0], 'tuck'), '12000o'],
  ])('writes the %s as %s', (_name, described, notation) => {
    expect(figNotation(described)).toBe(notation)
  })

  it('has no notation for a handspring', () => {
    expect(figNotation(element('backward', 0, [], null, 'floor'))).toBeNull()
  })

  it('does not record the direction: a front and a back tuck share a notation', () => {
    expect(figNotation(element('forward', 4, [0], 'tuck'))).toBe(
      figNotation(element('backward', 4, [0], 'tuck')),
    )
  })
})

describe('trampolineDifficulty', () => {
  it('names the edition of the code it follows', () => {
    expect(trampolineDifficultyEdition).toBe('FIG Trampoline Code of Points 2005')
  })

  it.each([
    // FIG Trampoline Code of Points 2005, Part III, appendix A (principles) and B (examples)
    ['back somersault tuck', 4, [0], 'tuck', 0.5],
    ['back somersault pike', 4, [0], 'pike', 0.6],
    ['barani straight', 4, [1], 'straight', 0.6],
    ['barani pike', 4, [1], 'pike', 0.6],
    ['double back tuck', 8, [0, 0], 'tuck', 1.0],
    ['double back pike', 8, [0, 0], 'pike', 1.2],
    ['¾ back tuck', 3, [0], 'tuck', 0.3],
    ['¾ back pike', 3, [0], 'pike', 0.3],
    ['cody tuck', 5, [0, 0], 'tuck', 0.6],
    ['cody pike', 5, [0, 0], 'pike', 0.7],
    ['barani ball out', 5, [1, 0], 'tuck', 0.7],
    ['full', 4, [2], 'straight', 0.7],
    ['rudolph', 4, [3], 'straight', 0.8],
    ['1¾ somersault tuck', 7, [0, 0], 'tuck', 0.8],
    ['1¾ somersault pike', 7, [0, 0], 'pike', 0.9],
    ['double full', 4, [4], 'straight', 0.9],
    ['half out tuck', 8, [0, 1], 'tuck', 1.1],
    ['half out pike', 8, [0, 1], 'pike', 1.3],
    ['half in half out tuck', 8, [1, 1], 'tuck', 1.2],
    ['full out straight', 8, [0, 2], 'straight', 1.4],
    ['2¾ somersault pike', 11, [0, 0, 0], 'pike', 1.5],
    ['full in half out pike', 8, [2, 1], 'pike', 1.5],
    ['full in full out tuck', 8, [2, 2], 'tuck', 1.4],
    ['randi out tuck', 8, [0, 5], 'tuck', 1.5],
    ['full in randi out straight', 8, [2, 5], 'straight', 1.9],
    ['triple back tuck', 12, [0, 0, 0], 'tuck', 1.5],
    ['triple back pike', 12, [0, 0, 0], 'pike', 1.7],
    ['half out triffis tuck', 12, [0, 0, 1], 'tuck', 1.6],
    ['half in half out triffis pike', 12, [1, 0, 1], 'pike', 1.9],
    ['full in half out triffis straight', 12, [2, 0, 1], 'straight', 2.0],
    ['rudi out triffis tuck', 12, [0, 0, 3], 'tuck', 1.8],
  ] as const)('values a %s at %d', (_name, quarters, twists, shape, value) => {
    expect(trampolineDifficulty({ quarterRotations: quarters, twists, shape })).toBe(value)
  })

  it.each([
    // Derived from the FIG Trampoline Code of Points 2005 formula, not listed in its table
    ['quadruple back tuck', 16, [0, 0, 0, 0], 'tuck', 2.0],
    ['double-full-in double back tuck', 8, [4, 0], 'tuck', 1.4],
  ] as const)('values a %s at %d by the same formula', (_name, quarters, twists, shape, value) => {
    expect(trampolineDifficulty({ quarterRotations: quarters, twists, shape })).toBe(value)
  })

  it('has no value for a non-salto element', () => {
    expect(trampolineDifficulty({ quarterRotations: 0, twists: [], shape: null })).toBeNull()
  })
})

describe('difficultyValue', () => {
  it.each([
    // FIG women's artistic Code of Points, letter values (from memory)
    ['A', 0.1],
    ['B', 0.2],
    ['D', 0.4],
    ['E', 0.5],
    ['H', 0.8],
    ['J', 1.0],
  ] as const)('values the letter %s at %d', (letter, value) => {
    expect(difficultyValue(letter)).toBe(value)
  })

  it('has no value without a letter', () => {
    expect(difficultyValue(null)).toBeNull()
    expect(difficultyValue(undefined)).toBeNull()
  })
})

describe('counterpartKey and descriptionKey', () => {
  it('mirrors a backward element onto the forward element with the same description', () => {
    const back = element('backward', 8, [2, 0], 'tuck')
    const front = element('forward', 8, [2, 0], 'tuck')
    expect(counterpartKey(back)).toBe(descriptionKey(front))
    expect(counterpartKey(front)).toBe(descriptionKey(back))
  })

  it.each([
    ['twist placement', element('forward', 8, [0, 2], 'tuck')],
    ['shape', element('forward', 8, [2, 0], 'pike')],
    ['apparatus', element('forward', 8, [2, 0], 'tuck', 'floor')],
    ['rotation', element('forward', 12, [2, 0, 0], 'tuck')],
  ])('does not mirror across a different %s', (_difference, other) => {
    expect(counterpartKey(element('backward', 8, [2, 0], 'tuck'))).not.toBe(descriptionKey(other))
  })

  it('has no counterpart for a sideward element', () => {
    expect(counterpartKey(element('sideward', 4, [0], 'tuck', 'floor'))).toBeNull()
  })

  it('tells non-salto elements apart by name, without the direction words', () => {
    const frontWalkover = element('forward', 0, [], null, 'floor', 'Front walkover')
    const backWalkover = element('backward', 0, [], null, 'floor', 'Back walkover')
    const frontHandspring = element('forward', 0, [], null, 'floor', 'Front handspring')
    expect(counterpartKey(backWalkover)).toBe(descriptionKey(frontWalkover))
    expect(descriptionKey(frontWalkover)).not.toBe(descriptionKey(frontHandspring))
  })

  it('ignores the name of a salto', () => {
    const a = element('backward', 4, [0], 'tuck', 'floor', 'Back tuck')
    const b = element('backward', 4, [0], 'tuck', 'floor', 'Back salto tucked')
    expect(descriptionKey(a)).toBe(descriptionKey(b))
  })
})

describe('findCounterparts and catalogueGaps', () => {
  const catalogue = [
    { id: 'back-double', ...element('backward', 8, [0, 0], 'tuck') },
    { id: 'front-double', ...element('forward', 8, [0, 0], 'tuck') },
    { id: 'back-full-in', ...element('backward', 8, [2, 0], 'tuck') },
    { id: 'front-full-out', ...element('forward', 8, [0, 2], 'tuck') },
    { id: 'front-full-in', ...element('forward', 8, [2, 0], 'tuck') },
    { id: 'side', ...element('sideward', 4, [0], 'tuck') },
    { id: 'back-layout', ...element('backward', 4, [0], 'straight') },
  ]

  it.each([
    ['back-double', 'front-double'],
    ['front-double', 'back-double'],
    ['back-full-in', 'front-full-in'],
    ['front-full-in', 'back-full-in'],
    ['front-full-out', null],
    ['side', null],
    ['back-layout', null],
  ])('pairs %s with %s', (id, counterpart) => {
    expect(findCounterparts(catalogue).get(id)).toBe(counterpart)
  })

  it('lists the elements whose mirror is missing, by direction', () => {
    const gaps = catalogueGaps(catalogue)
    expect(gaps.backwardWithoutForward.map((e) => e.id)).toEqual(['back-layout'])
    expect(gaps.forwardWithoutBackward.map((e) => e.id)).toEqual(['front-full-out'])
  })

  it('shows a gap once an element’s counterpart is removed', () => {
    const withoutFrontDouble = catalogue.filter((e) => e.id !== 'front-double')
    expect(catalogueGaps(withoutFrontDouble).backwardWithoutForward.map((e) => e.id)).toEqual([
      'back-double',
      'back-layout',
    ])
  })
})

describe('deriveElement', () => {
  it('derives every field of a full-in back tuck on the floor in one object', () => {
    expect(
      deriveElement({ ...element('backward', 8, [2, 0], 'tuck', 'floor'), difficultyLetter: 'E' }),
    ).toEqual({
      saltoCount: 2,
      totalHalfTwists: 2,
      rotationClass: 'double',
      twistBand: 'full',
      notation: '820o',
      // FIG Trampoline Code of Points 2005: 0.8 + 0.2 completed saltos + 0.2 twist
      trampolineDifficulty: 1.2,
      difficultyValue: 0.5,
      counterpartKey: 'floor|forward|8|2.0|tuck',
      descriptionKey: 'floor|backward|8|2.0|tuck',
    })
  })

  it('derives nulls for a back handspring', () => {
    expect(deriveElement(element('backward', 0, [], null, 'floor', 'Back handspring'))).toEqual({
      saltoCount: 0,
      totalHalfTwists: 0,
      rotationClass: 'none',
      twistBand: 'none',
      notation: null,
      trampolineDifficulty: null,
      difficultyValue: null,
      counterpartKey: 'floor|forward|0|handspring',
      descriptionKey: 'floor|backward|0|handspring',
    })
  })
})

describe('findPrerequisiteCycle', () => {
  const edge = (elementId: string, requiresElementId: string) => ({ elementId, requiresElementId })

  it('finds no cycle in a chain or a diamond', () => {
    expect(findPrerequisiteCycle([edge('c', 'b'), edge('b', 'a')])).toBeNull()
    expect(
      findPrerequisiteCycle([edge('d', 'b'), edge('d', 'c'), edge('b', 'a'), edge('c', 'a')]),
    ).toBeNull()
  })

  it('names the cycle in order, back to its start', () => {
    expect(findPrerequisiteCycle([edge('a', 'b'), edge('b', 'c'), edge('c', 'a')])).toEqual([
      'a',
      'b',
      'c',
      'a',
    ])
  })

  it('starts the cycle at the element of the new edge that closes it', () => {
    const existing = [edge('full-in', 'double-back'), edge('double-back', 'back-tuck')]
    expect(findPrerequisiteCycle(existing, [edge('back-tuck', 'full-in')])).toEqual([
      'back-tuck',
      'full-in',
      'double-back',
      'back-tuck',
    ])
  })

  it('finds an element that requires itself', () => {
    expect(findPrerequisiteCycle([], [edge('a', 'a')])).toEqual(['a', 'a'])
  })

  it('finds no cycle when a new edge only extends a chain', () => {
    expect(findPrerequisiteCycle([edge('x', 'y')], [edge('y', 'z')])).toBeNull()
  })

  it('walks a chain of 20 000 prerequisites without overflowing the stack', () => {
    const chain = Array.from({ length: 20_000 }, (_, i) => edge(`e${i}`, `e${i + 1}`))
    expect(findPrerequisiteCycle(chain)).toBeNull()
    const cycle = findPrerequisiteCycle(chain, [edge('e20000', 'e0')])
    expect(cycle?.length).toBe(20_002)
    expect(cycle?.[0]).toBe('e20000')
    expect(cycle?.at(-1)).toBe('e20000')
  })
})
