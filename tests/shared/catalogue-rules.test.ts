// Rules of the catalogue that catalogue.test.ts leaves open: direction words in the names of
// non-salto elements, and prerequisite cycles through an element with several prerequisites.
// Twofold's own rules (product brief): common practice (no published source).
import { describe, expect, it } from 'vitest'
import {
  counterpartKey,
  descriptionKey,
  figNotation,
  findCounterparts,
  findPrerequisiteCycle,
  type ElementDescription,
} from '../../shared/domain/catalogue.ts'
import type { Direction } from '../../shared/domain/element.ts'

const nonSalto = (direction: Direction, name: string, apparatus = 'floor'): ElementDescription => ({
  name,
  apparatus,
  direction,
  quarterRotations: 0,
  twists: [],
  shape: null,
})

describe('direction words in the names of non-salto elements', () => {
  it.each([
    ['Front walkover', 'Back walkover'],
    ['Forward walkover', 'Backward walkover'],
    ['Fwd walkover', 'Bwd walkover'],
    ['FORWARD  Roll', '  backward roll '],
  ])('pairs the forward "%s" with the backward "%s"', (forward, backward) => {
    const f = nonSalto('forward', forward)
    const b = nonSalto('backward', backward)
    expect(counterpartKey(f)).toBe(descriptionKey(b))
    expect(counterpartKey(b)).toBe(descriptionKey(f))
  })

  it('keeps the other words, so a walkover never pairs with a handspring', () => {
    expect(descriptionKey(nonSalto('forward', 'Forward walkover'))).toBe('floor|forward|0|walkover')
    expect(counterpartKey(nonSalto('forward', 'Front walkover'))).not.toBe(
      descriptionKey(nonSalto('backward', 'Back handspring')),
    )
    // a word that only contains a direction word is kept
    expect(descriptionKey(nonSalto('forward', 'Frontal roll'))).toBe('floor|forward|0|frontal roll')
  })

  it('compares the apparatus whatever its case and spaces', () => {
    const f = nonSalto('forward', 'Front walkover', ' Floor ')
    expect(descriptionKey(f)).toBe('floor|forward|0|walkover')
  })

  it('pairs the first of two elements with one description', () => {
    const catalogue = [
      { id: 'fwo-1', ...nonSalto('forward', 'Front walkover') },
      { id: 'fwo-2', ...nonSalto('forward', 'Forward walkover') },
      { id: 'bwo', ...nonSalto('backward', 'Back walkover') },
    ]
    expect(findCounterparts(catalogue).get('bwo')).toBe('fwo-1')
  })
})

describe('notation and keys of elements without a shape or a salto', () => {
  it('gives no FIG notation without a salto or without a shape', () => {
    // FIG Trampoline Code of Points: the notation is quarter saltos, twists per salto, shape
    expect(figNotation({ quarterRotations: 4, twists: [0], shape: 'tuck' })).toBe('40o')
    expect(figNotation({ quarterRotations: 0, twists: [], shape: 'tuck' })).toBeNull()
    expect(figNotation({ quarterRotations: 4, twists: [0], shape: null })).toBeNull()
  })

  it('writes a salto of no stated shape as a dash in its key', () => {
    const salto: ElementDescription = {
      name: 'Back salto',
      apparatus: 'floor',
      direction: 'backward',
      quarterRotations: 4,
      twists: [0],
      shape: null,
    }
    expect(descriptionKey(salto)).toBe('floor|backward|4|0|-')
    expect(counterpartKey(salto)).toBe('floor|forward|4|0|-')
  })
})

describe('prerequisite cycles through an element with several prerequisites', () => {
  const edge = (elementId: string, requiresElementId: string) => ({ elementId, requiresElementId })

  it('follows every prerequisite listed for an element, not only the first', () => {
    // a requires b and c; c requires a: the cycle runs through a's second prerequisite
    expect(findPrerequisiteCycle([edge('a', 'b'), edge('a', 'c'), edge('c', 'a')])).toEqual([
      'a',
      'c',
      'a',
    ])
    // and through its first: a requires b and c; b requires a
    expect(findPrerequisiteCycle([edge('a', 'b'), edge('a', 'c'), edge('b', 'a')])).toEqual([
      'a',
      'b',
      'a',
    ])
    // the same with the edges about to be saved
    expect(findPrerequisiteCycle([edge('c', 'a')], [edge('a', 'b'), edge('a', 'c')])).toEqual([
      'a',
      'c',
      'a',
    ])
  })

  it('starts the cycle at the new edge that closes it, even when reached from elsewhere', () => {
    // x → a → b → c and the new c → a close a ring a → b → c → a, found from x; reported from c,
    // the element being edited
    const existing = [edge('a', 'b'), edge('b', 'c')]
    expect(findPrerequisiteCycle(existing, [edge('x', 'a'), edge('c', 'a')])).toEqual([
      'c',
      'a',
      'b',
      'c',
    ])
  })

  it('does not start the cycle at a new edge that only leads into it', () => {
    // new x → b leads into the ring b → c → a → b (found from x); new c → a closes it
    const existing = [edge('a', 'b'), edge('b', 'c')]
    expect(findPrerequisiteCycle(existing, [edge('x', 'b'), edge('c', 'a')])).toEqual([
      'c',
      'a',
      'b',
      'c',
    ])
  })

  it('does not start the cycle at a new edge that only leaves it', () => {
    // new b → x leaves the ring b → c → a → b (found from b); new a → b closes it
    const existing = [edge('b', 'c'), edge('c', 'a')]
    expect(findPrerequisiteCycle(existing, [edge('b', 'x'), edge('a', 'b')])).toEqual([
      'a',
      'b',
      'c',
      'a',
    ])
  })

  it('reports the cycle as found when no new edge is on it', () => {
    const existing = [edge('b', 'c'), edge('c', 'b')]
    expect(findPrerequisiteCycle(existing, [edge('a', 'b')])).toEqual(['b', 'c', 'b'])
  })

  it('does not report an element reached twice without a cycle', () => {
    // d requires b and c, both of which require a: a is visited twice, no cycle
    expect(
      findPrerequisiteCycle([], [edge('d', 'b'), edge('d', 'c'), edge('b', 'a'), edge('c', 'a')]),
    ).toBeNull()
  })

  it('reports a cycle from the first new edge on it', () => {
    // a → b and b → c are new, c → a exists: the ring is found from a and stays as found
    expect(findPrerequisiteCycle([edge('c', 'a')], [edge('a', 'b'), edge('b', 'c')])).toEqual([
      'a',
      'b',
      'c',
      'a',
    ])
  })

  it('visits each element once: a ladder of 40 diamonds is answered at once', () => {
    // d(i) requires l(i) and r(i), both of which require d(i+1): 2^40 paths but 121 elements,
    // so a search that revisited finished elements would never end (the documented O(n + e))
    const ladder = Array.from({ length: 40 }, (_, i) => [
      edge(`d${i}`, `l${i}`),
      edge(`d${i}`, `r${i}`),
      edge(`l${i}`, `d${i + 1}`),
      edge(`r${i}`, `d${i + 1}`),
    ]).flat()
    expect(findPrerequisiteCycle(ladder)).toBeNull()
    expect(findPrerequisiteCycle(ladder, [edge('d40', 'd0')])?.length).toBe(82)
  })
})
