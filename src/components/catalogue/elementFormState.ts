import type { DifficultyLetter } from '@shared/domain/catalogue'
import type { Direction, Shape, TakeOff } from '@shared/domain/element'
import type { ElementInput } from '@shared/schemas/elements'

/** What the element form holds while it is filled in: blanks allowed, checked on save. */
export interface ElementFormState {
  name: string
  apparatus: string | null
  direction: Direction
  quarterRotations: number | null
  twists: (number | null)[]
  shape: Shape | null
  takeOff: TakeOff | null
  difficultyLetter: DifficultyLetter | null
  notes: string
}

/** The form's values for an element, or the starting values of a new one. */
export function elementFormState(input?: ElementInput): ElementFormState {
  if (!input) {
    // A single back salto is the most common element to add, so the preview starts useful.
    return {
      name: '',
      apparatus: 'floor',
      direction: 'backward',
      quarterRotations: 4,
      twists: [0],
      shape: 'tuck',
      takeOff: 'standing',
      difficultyLetter: null,
      notes: '',
    }
  }
  return {
    name: input.name,
    apparatus: input.apparatus,
    direction: input.direction,
    quarterRotations: input.quarterRotations,
    twists: [...input.twists],
    shape: input.shape,
    takeOff: input.takeOff,
    difficultyLetter: input.difficultyLetter ?? null,
    notes: input.notes ?? '',
  }
}

/** What the form sends: the schema checks it before it goes. */
export function elementFormInput(form: ElementFormState): unknown {
  return {
    name: form.name,
    apparatus: form.apparatus ?? '',
    direction: form.direction,
    quarterRotations: form.quarterRotations,
    twists: form.twists,
    shape: form.shape,
    takeOff: form.takeOff,
    difficultyLetter: form.difficultyLetter,
    notes: form.notes.trim() === '' ? null : form.notes,
  }
}
