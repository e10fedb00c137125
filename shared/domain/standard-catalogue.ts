// The catalogue every new club starts from. It is balanced on purpose: every forward or backward
// element has its mirror, so that a club's gaps come from its own edits, not from the starting
// point. Only sideward elements (cartwheel, round-off, side somersault, aerial cartwheel) stand
// alone. Names use the trade's generic terms.

import type { ElementInput } from '../schemas/elements.ts'
import type { DifficultyLetter } from './catalogue.ts'
import type { Direction, Shape, TakeOff } from './element.ts'

type Row = [
  name: string,
  direction: Direction,
  quarterRotations: number,
  twists: number[],
  shape: Shape | null,
  takeOff: TakeOff,
  difficultyLetter?: DifficultyLetter,
]

function onApparatus(apparatus: string, rows: Row[]): ElementInput[] {
  return rows.map(([name, direction, quarterRotations, twists, shape, takeOff, letter]) => ({
    name,
    apparatus,
    direction,
    quarterRotations,
    twists,
    shape,
    takeOff,
    ...(letter === undefined ? {} : { difficultyLetter: letter }),
  }))
}

// Difficulty letters are given only where the women's artistic value is well known, and are
// from memory (FIG women's artistic Code of Points); a club can correct them.
const floor = onApparatus('floor', [
  ['Front handspring', 'forward', 0, [], null, 'punch'],
  ['Back handspring', 'backward', 0, [], null, 'standing'],
  ['Front walkover', 'forward', 0, [], null, 'standing'],
  ['Back walkover', 'backward', 0, [], null, 'standing'],
  ['Front limber', 'forward', 0, [], null, 'standing'],
  ['Back limber', 'backward', 0, [], null, 'standing'],
  ['Cartwheel', 'sideward', 0, [], null, 'standing'],
  ['Round-off', 'sideward', 0, [], null, 'punch'],

  ['Front tuck', 'forward', 4, [0], 'tuck', 'punch', 'A'],
  ['Back tuck', 'backward', 4, [0], 'tuck', 'round-off', 'A'],
  ['Front pike', 'forward', 4, [0], 'pike', 'punch'],
  ['Back pike', 'backward', 4, [0], 'pike', 'round-off'],
  ['Front layout', 'forward', 4, [0], 'straight', 'punch'],
  ['Back layout', 'backward', 4, [0], 'straight', 'round-off'],
  ['Side somersault', 'sideward', 4, [0], 'tuck', 'standing'],
  ['Aerial cartwheel', 'sideward', 4, [0], 'straight', 'punch'],

  ['Barani', 'forward', 4, [1], 'straight', 'punch'],
  ['Back layout half twist', 'backward', 4, [1], 'straight', 'round-off'],
  ['Front full', 'forward', 4, [2], 'straight', 'punch'],
  ['Back full', 'backward', 4, [2], 'straight', 'round-off'],
  ['Front 1½ twist', 'forward', 4, [3], 'straight', 'punch'],
  ['Back 1½ twist', 'backward', 4, [3], 'straight', 'round-off'],
  ['Front double twist', 'forward', 4, [4], 'straight', 'punch'],
  ['Back double twist', 'backward', 4, [4], 'straight', 'round-off'],

  ['Double front tuck', 'forward', 8, [0, 0], 'tuck', 'punch'],
  ['Double back tuck', 'backward', 8, [0, 0], 'tuck', 'round-off', 'D'],
  ['Double front pike', 'forward', 8, [0, 0], 'pike', 'punch'],
  ['Double back pike', 'backward', 8, [0, 0], 'pike', 'round-off'],
  ['Double front layout', 'forward', 8, [0, 0], 'straight', 'punch'],
  ['Double back layout', 'backward', 8, [0, 0], 'straight', 'round-off'],

  ['Half-in front tuck', 'forward', 8, [1, 0], 'tuck', 'punch'],
  ['Half-in back tuck', 'backward', 8, [1, 0], 'tuck', 'round-off'],
  ['Half-out front tuck', 'forward', 8, [0, 1], 'tuck', 'punch'],
  ['Half-out back tuck', 'backward', 8, [0, 1], 'tuck', 'round-off'],
  ['Full-in front tuck', 'forward', 8, [2, 0], 'tuck', 'punch'],
  ['Full-in back tuck', 'backward', 8, [2, 0], 'tuck', 'round-off', 'E'],
  ['Full-out front tuck', 'forward', 8, [0, 2], 'tuck', 'punch'],
  ['Full-out back tuck', 'backward', 8, [0, 2], 'tuck', 'round-off'],
  ['Full-in front pike', 'forward', 8, [2, 0], 'pike', 'punch'],
  ['Full-in back pike', 'backward', 8, [2, 0], 'pike', 'round-off'],
  ['Full-out front layout', 'forward', 8, [0, 2], 'straight', 'punch'],
  ['Full-out back layout', 'backward', 8, [0, 2], 'straight', 'round-off'],
])

const tumbling = onApparatus('tumbling', [
  ['Front handspring', 'forward', 0, [], null, 'punch'],
  ['Back handspring', 'backward', 0, [], null, 'round-off'],
  ['Round-off', 'sideward', 0, [], null, 'punch'],

  ['Front tuck', 'forward', 4, [0], 'tuck', 'punch'],
  ['Back tuck', 'backward', 4, [0], 'tuck', 'back-handspring'],
  ['Front pike', 'forward', 4, [0], 'pike', 'punch'],
  ['Back pike', 'backward', 4, [0], 'pike', 'back-handspring'],
  ['Front layout', 'forward', 4, [0], 'straight', 'front-handspring'],
  ['Back layout', 'backward', 4, [0], 'straight', 'back-handspring'],

  ['Barani', 'forward', 4, [1], 'straight', 'punch'],
  ['Back layout half twist', 'backward', 4, [1], 'straight', 'back-handspring'],
  ['Front full', 'forward', 4, [2], 'straight', 'front-handspring'],
  ['Back full', 'backward', 4, [2], 'straight', 'back-handspring'],
  ['Front 1½ twist', 'forward', 4, [3], 'straight', 'front-handspring'],
  ['Back 1½ twist', 'backward', 4, [3], 'straight', 'back-handspring'],
  ['Front double twist', 'forward', 4, [4], 'straight', 'front-handspring'],
  ['Back double twist', 'backward', 4, [4], 'straight', 'back-handspring'],

  ['Double front tuck', 'forward', 8, [0, 0], 'tuck', 'punch'],
  ['Double back tuck', 'backward', 8, [0, 0], 'tuck', 'back-handspring'],
  ['Double front pike', 'forward', 8, [0, 0], 'pike', 'punch'],
  ['Double back pike', 'backward', 8, [0, 0], 'pike', 'back-handspring'],
  ['Double front layout', 'forward', 8, [0, 0], 'straight', 'front-handspring'],
  ['Double back layout', 'backward', 8, [0, 0], 'straight', 'back-handspring'],

  ['Half-in front tuck', 'forward', 8, [1, 0], 'tuck', 'punch'],
  ['Half-in back tuck', 'backward', 8, [1, 0], 'tuck', 'back-handspring'],
  ['Half-out front tuck', 'forward', 8, [0, 1], 'tuck', 'punch'],
  ['Half-out back tuck', 'backward', 8, [0, 1], 'tuck', 'back-handspring'],
  ['Full-in front tuck', 'forward', 8, [2, 0], 'tuck', 'punch'],
  ['Full-in back tuck', 'backward', 8, [2, 0], 'tuck', 'back-handspring'],
  ['Full-out front tuck', 'forward', 8, [0, 2], 'tuck', 'punch'],
  ['Full-out back tuck', 'backward', 8, [0, 2], 'tuck', 'back-handspring'],
])

const trampoline = onApparatus('trampoline', [
  ['Front somersault tuck', 'forward', 4, [0], 'tuck', 'trampoline-bounce'],
  ['Back somersault tuck', 'backward', 4, [0], 'tuck', 'trampoline-bounce'],
  ['Front somersault pike', 'forward', 4, [0], 'pike', 'trampoline-bounce'],
  ['Back somersault pike', 'backward', 4, [0], 'pike', 'trampoline-bounce'],
  ['Front somersault straight', 'forward', 4, [0], 'straight', 'trampoline-bounce'],
  ['Back somersault straight', 'backward', 4, [0], 'straight', 'trampoline-bounce'],

  ['Barani', 'forward', 4, [1], 'straight', 'trampoline-bounce'],
  ['Back somersault half twist', 'backward', 4, [1], 'straight', 'trampoline-bounce'],
  ['Front full twist', 'forward', 4, [2], 'straight', 'trampoline-bounce'],
  ['Full twisting back', 'backward', 4, [2], 'straight', 'trampoline-bounce'],
  ['Rudolph', 'forward', 4, [3], 'straight', 'trampoline-bounce'],
  ['Back 1½ twist', 'backward', 4, [3], 'straight', 'trampoline-bounce'],
  ['Front double twist', 'forward', 4, [4], 'straight', 'trampoline-bounce'],
  ['Double full', 'backward', 4, [4], 'straight', 'trampoline-bounce'],

  ['Double front tuck', 'forward', 8, [0, 0], 'tuck', 'trampoline-bounce'],
  ['Double back tuck', 'backward', 8, [0, 0], 'tuck', 'trampoline-bounce'],
  ['Double front pike', 'forward', 8, [0, 0], 'pike', 'trampoline-bounce'],
  ['Double back pike', 'backward', 8, [0, 0], 'pike', 'trampoline-bounce'],
  ['Double front straight', 'forward', 8, [0, 0], 'straight', 'trampoline-bounce'],
  ['Double back straight', 'backward', 8, [0, 0], 'straight', 'trampoline-bounce'],

  ['Half-in front tuck', 'forward', 8, [1, 0], 'tuck', 'trampoline-bounce'],
  ['Half-in back tuck', 'backward', 8, [1, 0], 'tuck', 'trampoline-bounce'],
  ['Barani-out tuck', 'forward', 8, [0, 1], 'tuck', 'trampoline-bounce'],
  ['Half-out back tuck', 'backward', 8, [0, 1], 'tuck', 'trampoline-bounce'],
  ['Barani-out pike', 'forward', 8, [0, 1], 'pike', 'trampoline-bounce'],
  ['Half-out back pike', 'backward', 8, [0, 1], 'pike', 'trampoline-bounce'],
  ['Full-in front tuck', 'forward', 8, [2, 0], 'tuck', 'trampoline-bounce'],
  ['Full-in back tuck', 'backward', 8, [2, 0], 'tuck', 'trampoline-bounce'],
  ['Full-out front tuck', 'forward', 8, [0, 2], 'tuck', 'trampoline-bounce'],
  ['Full-out back tuck', 'backward', 8, [0, 2], 'tuck', 'trampoline-bounce'],
  ['Half-in half-out front tuck', 'forward', 8, [1, 1], 'tuck', 'trampoline-bounce'],
  ['Half-in half-out back tuck', 'backward', 8, [1, 1], 'tuck', 'trampoline-bounce'],

  ['Triple front tuck', 'forward', 12, [0, 0, 0], 'tuck', 'trampoline-bounce'],
  ['Triple back tuck', 'backward', 12, [0, 0, 0], 'tuck', 'trampoline-bounce'],
  ['Triple front pike', 'forward', 12, [0, 0, 0], 'pike', 'trampoline-bounce'],
  ['Triple back pike', 'backward', 12, [0, 0, 0], 'pike', 'trampoline-bounce'],
  ['Half-out triffis front tuck', 'forward', 12, [0, 0, 1], 'tuck', 'trampoline-bounce'],
  ['Half-out triffis back tuck', 'backward', 12, [0, 0, 1], 'tuck', 'trampoline-bounce'],
])

/** The standard catalogue: floor, tumbling and trampoline, forward and backward side by side. */
export const standardCatalogue: readonly ElementInput[] = [...floor, ...tumbling, ...trampoline]
