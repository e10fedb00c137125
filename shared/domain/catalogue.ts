// Everything Twofold derives from an element's description. The description is typed in once;
// these values are recomputed wherever they are shown so that they can never drift from it.

import type { Direction, RotationClass, Shape, TwistBand } from './element.ts'

/** The letters of the artistic codes of points, A (easiest) to J. */
export const difficultyLetters = ['A', 'B', 'C', 'D', 'E', 'F', 'G', 'H', 'I', 'J'] as const
export type DifficultyLetter = (typeof difficultyLetters)[number]

/**
 * Apparatus judged with the artistic letter values. The letter means nothing on trampoline or
 * tumbling, whose codes value an element by formula instead.
 */
export const artisticApparatus = ['floor'] as const

export const maxQuarterRotations = 16
export const maxHalfTwistsPerSalto = 8

export const trampolineDifficultyEdition = 'FIG Trampoline Code of Points 2005'

/** What the derivations need to know about an element: the parts a coach types in. */
export interface ElementDescription {
  name: string
  apparatus: string
  direction: Direction
  quarterRotations: number
  /** Half turns of twist in each salto, first salto first. */
  twists: readonly number[]
  shape: Shape | null
}

export type SaltoGeometry = Pick<ElementDescription, 'quarterRotations' | 'twists' | 'shape'>

/** Everything derived from a description, in one object for the live preview and the server. */
export interface DerivedElement {
  saltoCount: number
  totalHalfTwists: number
  rotationClass: RotationClass
  twistBand: TwistBand
  notation: string | null
  trampolineDifficulty: number | null
  difficultyValue: number | null
  counterpartKey: string | null
  descriptionKey: string
}

/**
 * Number of saltos an element is counted as, which is also the number of twist entries it needs.
 *
 * A partial salto counts as the salto being worked on (rounded up): a ¾ salto has one salto in
 * which a twist can be placed, a 1¼ salto has two. Zero quarter rotations is a non-salto element
 * (handspring, walkover), which has no twist entries.
 */
export function saltoCount(quarterRotations: number): number {
  return Math.ceil(quarterRotations / 4)
}

/** Total twist of the element in half turns, summed over its saltos. */
export function totalHalfTwists(twists: readonly number[]): number {
  return twists.reduce((sum, halfTurns) => sum + halfTurns, 0)
}

/**
 * Rotation class for the coverage grid and the requirements, by the saltos completed: a double
 * salto is two full rotations (8 quarters), so a 1¼ salto (5 quarters) or a 1¾ (7) is still of
 * the single class, as the FIG trampoline difficulty counts a salto only once it is completed
 * (see {@link trampolineDifficulty}). 0 quarter rotations is none; a salto short of a full
 * rotation (1–3 quarters) is single, the only salto class below a double; 8–11 double; 12 and
 * more triple. Quadruple saltos (16) are rare enough to share the triple class, so the grid
 * keeps four columns. (The twist entries still follow {@link saltoCount}, rounded up.)
 */
export function rotationClass(quarterRotations: number): RotationClass {
  if (quarterRotations <= 0) return 'none'
  if (quarterRotations < 8) return 'single'
  if (quarterRotations < 12) return 'double'
  return 'triple'
}

/** Twist band for the coverage grid: 0 half turns none, 1 half, 2 full, anything above more. */
export function twistBand(halfTwists: number): TwistBand {
  if (halfTwists <= 0) return 'none'
  if (halfTwists === 1) return 'half'
  if (halfTwists === 2) return 'full'
  return 'more'
}

const shapeSymbols: Record<Shape, string> = { tuck: 'o', pike: '<', straight: '/' }

/**
 * The FIG trampoline numeric notation: the number of quarter saltos, then one digit per salto
 * giving the half twists in that salto, then the shape symbol (o tuck, < pike, / straight).
 * Back tuck is `40o`, full-in double back tuck `820o`, triple back tuck `12000o`.
 *
 * The notation does not record the direction (on the trampoline it follows from the take-off and
 * the twists); Twofold stores the direction beside it. Non-salto elements have no notation: null.
 */
export function figNotation(element: SaltoGeometry): string | null {
  if (element.quarterRotations <= 0 || element.shape === null) return null
  return `${element.quarterRotations}${element.twists.join('')}${shapeSymbols[element.shape]}`
}

/**
 * Degree of difficulty by the formula of the FIG Trampoline Code of Points 2005 (Part III,
 * appendix A, "Difficulty calculation trampoline – principles"):
 * - 0.1 per quarter salto, and 0.1 more per completed salto (360°);
 * - 0.1 per half twist;
 * - +0.1 for a salto of 360°–630° without twist in pike or straight shape (a twisting single
 *   gets no shape bonus: a barani is 0.6 piked or straight);
 * - +0.2 for a salto of 720° or more, with or without twist, in pike or straight shape. The
 *   bonus is given once per element, not per salto: the published examples give 2¾ piked as
 *   1.3 + 0.2 = 1.5 and triple back piked as 1.7 against 1.5 tucked.
 *
 * Computed in tenths as integers so that no float drift reaches the display. Later editions of
 * the code changed the values of triples and beyond; this follows the 2005 edition named in
 * {@link trampolineDifficultyEdition}. Returns null for non-salto elements.
 */
export function trampolineDifficulty(element: SaltoGeometry): number | null {
  const quarters = element.quarterRotations
  if (quarters <= 0) return null
  const completedSaltos = Math.floor(quarters / 4)
  const halfTwists = totalHalfTwists(element.twists)
  const extended = element.shape === 'pike' || element.shape === 'straight'
  let shapeBonus = 0
  if (extended && quarters >= 8) shapeBonus = 2
  else if (extended && quarters >= 4 && halfTwists === 0) shapeBonus = 1
  const tenths = quarters + completedSaltos + halfTwists + shapeBonus
  return tenths / 10
}

/**
 * Value of an artistic difficulty letter: A = 0.1 up to J = 1.0, as in the FIG women's artistic
 * Code of Points. Null when the element carries no letter.
 */
export function difficultyValue(letter: DifficultyLetter | null | undefined): number | null {
  if (letter === null || letter === undefined) return null
  return (difficultyLetters.indexOf(letter) + 1) / 10
}

const directionWords = new Set(['front', 'back', 'forward', 'backward', 'fwd', 'bwd'])

/**
 * A non-salto element's geometry (0 quarter rotations, no twist, no shape) does not tell a
 * handspring from a walkover, so its key uses the name with the direction words taken out:
 * "Front walkover" and "Back walkover" both become "walkover".
 */
function nonSaltoStem(name: string): string {
  return name
    .toLowerCase()
    .split(/\s+/)
    .filter((word) => word !== '' && !directionWords.has(word))
    .join(' ')
}

function keyFor(element: ElementDescription, direction: Direction): string {
  const apparatus = element.apparatus.trim().toLowerCase()
  if (element.quarterRotations <= 0) {
    return `${apparatus}|${direction}|0|${nonSaltoStem(element.name)}`
  }
  const twists = element.twists.join('.')
  return `${apparatus}|${direction}|${element.quarterRotations}|${twists}|${element.shape ?? '-'}`
}

/**
 * Key of the element as described, including its own direction. Two elements of one club with
 * the same key describe the same skill twice. The take-off is left out on purpose: a back tuck
 * from a round-off and from a back handspring are one skill for the audit.
 */
export function descriptionKey(element: ElementDescription): string {
  return keyFor(element, element.direction)
}

/**
 * Key of the mirrored element: same apparatus, quarter rotations, twist placement (the twist list
 * in order, so a full-in mirrors a full-in, not a full-out) and shape, with the opposite
 * direction. Like {@link descriptionKey} it ignores the take-off. Sideward elements have no
 * mirror in the forward/backward audit: null.
 */
export function counterpartKey(element: ElementDescription): string | null {
  if (element.direction === 'sideward') return null
  return keyFor(element, element.direction === 'forward' ? 'backward' : 'forward')
}

/** All derived fields of one element, for the client's live preview and for the server. */
export function deriveElement(
  element: ElementDescription & { difficultyLetter?: DifficultyLetter | null },
): DerivedElement {
  const halfTwists = totalHalfTwists(element.twists)
  return {
    saltoCount: saltoCount(element.quarterRotations),
    totalHalfTwists: halfTwists,
    rotationClass: rotationClass(element.quarterRotations),
    twistBand: twistBand(halfTwists),
    notation: figNotation(element),
    trampolineDifficulty: trampolineDifficulty(element),
    difficultyValue: difficultyValue(element.difficultyLetter),
    counterpartKey: counterpartKey(element),
    descriptionKey: descriptionKey(element),
  }
}

/**
 * Each element's counterpart in the same list, by id, or null where the catalogue lacks it.
 * One pass to index the description keys and one to look the mirrors up: O(n). Should a club
 * hold two elements with one description, the first listed stands for both.
 */
export function findCounterparts<T extends ElementDescription & { id: string }>(
  elements: readonly T[],
): Map<string, string | null> {
  const idByKey = new Map<string, string>()
  for (const element of elements) {
    const key = descriptionKey(element)
    if (!idByKey.has(key)) idByKey.set(key, element.id)
  }
  const counterparts = new Map<string, string | null>()
  for (const element of elements) {
    const key = counterpartKey(element)
    counterparts.set(element.id, key === null ? null : (idByKey.get(key) ?? null))
  }
  return counterparts
}

export interface CatalogueGaps<T> {
  /** Backward elements whose forward counterpart is not in the catalogue. */
  backwardWithoutForward: T[]
  /** Forward elements whose backward counterpart is not in the catalogue. */
  forwardWithoutBackward: T[]
}

/**
 * The catalogue's own gaps, before any athlete is counted: each element whose mirror is missing,
 * in catalogue order. Sideward elements are never gaps.
 */
export function catalogueGaps<T extends ElementDescription & { id: string }>(
  elements: readonly T[],
): CatalogueGaps<T> {
  const counterparts = findCounterparts(elements)
  const gaps: CatalogueGaps<T> = { backwardWithoutForward: [], forwardWithoutBackward: [] }
  for (const element of elements) {
    if (counterparts.get(element.id) !== null) continue
    if (element.direction === 'backward') gaps.backwardWithoutForward.push(element)
    else if (element.direction === 'forward') gaps.forwardWithoutBackward.push(element)
  }
  return gaps
}

export interface PrerequisiteEdge {
  /** The element that has the prerequisite. */
  elementId: string
  /** The element it requires. */
  requiresElementId: string
}

/**
 * A cycle among prerequisites, or null when there is none. The cycle is returned as the ordered
 * ids it passes through with the first repeated at the end (a → b → c → a), so that a message can
 * name every element in it. When `newEdges` are given (the edges about to be saved) and the cycle
 * runs through one of them, it starts at that edge's element, which is the one the director is
 * editing.
 *
 * Depth-first search with an explicit stack, so a long chain of prerequisites cannot overflow the
 * call stack; O(nodes + edges).
 */
export function findPrerequisiteCycle(
  edges: readonly PrerequisiteEdge[],
  newEdges: readonly PrerequisiteEdge[] = [],
): string[] | null {
  const requires = new Map<string, string[]>()
  // New edges first, so that a cycle they close is the one found and reported.
  const allEdges = [...newEdges, ...edges]
  for (const edge of allEdges) {
    const targets = requires.get(edge.elementId)
    if (targets) targets.push(edge.requiresElementId)
    else requires.set(edge.elementId, [edge.requiresElementId])
  }

  const done = new Set<string>()
  for (const start of requires.keys()) {
    if (done.has(start)) continue
    const path: string[] = [start]
    const onPath = new Map<string, number>([[start, 0]])
    const nextIndex: number[] = [0]
    while (path.length > 0) {
      const depth = path.length - 1
      const node = path[depth] as string
      const targets = requires.get(node) ?? []
      const index = nextIndex[depth] as number
      if (index >= targets.length) {
        path.pop()
        nextIndex.pop()
        onPath.delete(node)
        done.add(node)
        continue
      }
      nextIndex[depth] = index + 1
      const target = targets[index] as string
      const cycleStart = onPath.get(target)
      if (cycleStart !== undefined) {
        return startAtNewEdge([...path.slice(cycleStart), target], newEdges)
      }
      if (done.has(target)) continue
      onPath.set(target, path.length)
      path.push(target)
      nextIndex.push(0)
    }
  }
  return null
}

function startAtNewEdge(cycle: string[], newEdges: readonly PrerequisiteEdge[]): string[] {
  const ring = cycle.slice(0, -1)
  for (const edge of newEdges) {
    const at = ring.findIndex(
      (id, i) => id === edge.elementId && ring[(i + 1) % ring.length] === edge.requiresElementId,
    )
    if (at >= 0) {
      const rotated = [...ring.slice(at), ...ring.slice(0, at)]
      return [...rotated, rotated[0] as string]
    }
  }
  return cycle
}
