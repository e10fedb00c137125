import type { Direction, Shape, TakeOff } from '@shared/domain/element'
import {
  directions,
  rotationClasses,
  rotationClassLabels,
  shapes,
  takeOffs,
  twistBands,
  twistBandLabels,
  modalities,
  modalityLabels,
} from '@shared/domain/element'

export { rotationClassLabels, twistBandLabels }

// How the element vocabulary is named on screen, in the trade's words.

export const directionLabels: Record<Direction, string> = {
  forward: 'Forward',
  backward: 'Backward',
  sideward: 'Sideward',
}

export const shapeLabels: Record<Shape, string> = {
  tuck: 'Tuck',
  pike: 'Pike',
  straight: 'Straight (layout)',
}

export const takeOffLabels: Record<TakeOff, string> = {
  standing: 'Standing',
  'round-off': 'From a round-off',
  'front-handspring': 'From a front handspring',
  'back-handspring': 'From a back handspring',
  punch: 'From a punch (hurdle)',
  'trampoline-bounce': 'From a trampoline bounce',
}

const options = <T extends string>(values: readonly T[], labels: Record<T, string>) =>
  values.map((value) => ({ label: labels[value], value }))

export const directionOptions = options(directions, directionLabels)
export const shapeOptions = options(shapes, shapeLabels)
export const takeOffOptions = options(takeOffs, takeOffLabels)
export const rotationClassOptions = options(rotationClasses, rotationClassLabels)
export const twistBandOptions = options(twistBands, twistBandLabels)
export const modalityOptions = options(modalities, modalityLabels)

const fractions = ['', '¼', '½', '¾']

/** Quarter saltos as a coach says them: 4 → "1 salto", 5 → "1¼ saltos", 0 → "no salto". */
export function formatRotation(quarterRotations: number): string {
  if (quarterRotations <= 0) return 'no salto'
  const whole = Math.floor(quarterRotations / 4)
  const part = fractions[quarterRotations % 4] ?? ''
  const amount = whole === 0 ? part : `${whole}${part}`
  return `${amount} ${quarterRotations <= 4 ? 'salto' : 'saltos'}`
}

/** Half turns of twist as a coach says them: 1 → "½ twist", 2 → "1 twist", 3 → "1½ twists". */
export function formatTwist(halfTurns: number): string {
  if (halfTurns <= 0) return 'no twist'
  const whole = Math.floor(halfTurns / 2)
  const amount = whole === 0 ? '½' : `${whole}${halfTurns % 2 === 1 ? '½' : ''}`
  return `${amount} ${halfTurns <= 2 ? 'twist' : 'twists'}`
}

/** A difficulty value with its one decimal, as the codes print them (0.5, 1.0). */
export const formatDifficulty = (value: number | null | undefined) =>
  value === null || value === undefined ? '—' : value.toFixed(1)
