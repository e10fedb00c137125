import { z } from 'zod'
import {
  artisticApparatus,
  difficultyLetters,
  maxHalfTwistsPerSalto,
  maxQuarterRotations,
  saltoCount,
} from '../domain/catalogue.ts'
import { directions, rotationClasses, shapes, takeOffs, twistBands } from '../domain/element.ts'
import { text } from './text.ts'

const saltoWords = ['single', 'double', 'triple', 'quadruple']

function saltoPhrase(count: number): string {
  const word = saltoWords[count - 1]
  return word === undefined ? `${count}-salto` : `${word} salto`
}

/** An apparatus name, as elements and requirement profiles give it. */
export const apparatusSchema = z
  .string({ error: 'Choose the apparatus.' })
  .trim()
  .min(1, { error: 'Choose the apparatus.', abort: true })
  .max(40, 'Keep the apparatus name to 40 characters or fewer.')
  .regex(
    /^[a-z0-9]+(-[a-z0-9]+)*$/,
    'Write the apparatus in lower-case letters, digits and dashes, e.g. floor or double-mini.',
  )

const elementFields = {
  name: text({ error: 'Enter the element name.' })
    .min(1, 'Enter the element name.')
    .max(80, 'Keep the element name to 80 characters or fewer.'),
  apparatus: apparatusSchema,
  direction: z.enum(directions, {
    error: 'Choose the direction of the salto: forward, backward or sideward.',
  }),
  quarterRotations: z
    .number({ error: 'Enter the rotation in quarter saltos as a number (4 = single, 8 = double).' })
    .int('Enter the rotation as a whole number of quarter saltos (4 = single, 8 = double).')
    .min(0, 'The rotation cannot be negative; use 0 for a handspring or walkover.')
    .max(
      maxQuarterRotations,
      `The rotation can be at most ${maxQuarterRotations} quarter saltos (a quadruple salto).`,
    ),
  twists: z.array(
    z
      .number({ error: 'Enter the twist of each salto as a number of half turns.' })
      .int('Enter the twist of each salto as a whole number of half turns.')
      .min(0, 'The twist in a salto cannot be negative; use 0 for no twist.')
      .max(
        maxHalfTwistsPerSalto,
        `The twist in one salto can be at most ${maxHalfTwistsPerSalto} half turns (4 twists).`,
      ),
    { error: 'List the half turns of twist in each salto.' },
  ),
  shape: z.enum(shapes, { error: 'Choose the body shape: tuck, pike or straight.' }).nullable(),
  takeOff: z.enum(takeOffs, { error: 'Choose the take-off.' }),
  difficultyLetter: z
    .enum(difficultyLetters, { error: 'The difficulty letter must be one of A to J.' })
    .nullish(),
  notes: text().max(2000, 'Keep the notes to 2000 characters or fewer.').nullish(),
}

type ElementFields = z.infer<z.ZodObject<typeof elementFields>>

// The rules that tie fields together; each refusal names the field the coach must change.
// A field that failed its own check is reported there, and is not used to judge the others.
function checkElement(element: ElementFields, ctx: z.RefinementCtx): void {
  if (elementFields.quarterRotations.safeParse(element.quarterRotations).success) {
    checkSaltoFields(element, ctx)
  }
  const letter = element.difficultyLetter
  const apparatusValid = elementFields.apparatus.safeParse(element.apparatus).success
  if (letter !== null && letter !== undefined && apparatusValid) {
    if (!(artisticApparatus as readonly string[]).includes(element.apparatus)) {
      ctx.addIssue({
        code: 'custom',
        path: ['difficultyLetter'],
        message: `The difficulty letter is only for artistic apparatus (floor); on ${element.apparatus} the difficulty follows from the rotation and twist.`,
      })
    }
  }
}

function checkSaltoFields(element: ElementFields, ctx: z.RefinementCtx): void {
  const saltos = saltoCount(element.quarterRotations)
  if (saltos === 0) {
    if (element.twists.length > 0) {
      ctx.addIssue({
        code: 'custom',
        path: ['twists'],
        message: `An element without a salto has no twist entries, since twist is counted per salto (got ${element.twists.length}).`,
      })
    }
    if (element.shape !== null) {
      ctx.addIssue({
        code: 'custom',
        path: ['shape'],
        message:
          'An element without a salto (handspring, walkover) has no body shape; leave it empty.',
      })
    }
  } else {
    if (element.twists.length !== saltos) {
      const entries = saltos === 1 ? 'entry' : 'entries'
      ctx.addIssue({
        code: 'custom',
        path: ['twists'],
        message: `A ${saltoPhrase(saltos)} needs ${saltos} twist ${entries}, one per salto (got ${element.twists.length}).`,
      })
    }
    if (element.shape === null) {
      ctx.addIssue({
        code: 'custom',
        path: ['shape'],
        message: `A ${saltoPhrase(saltos)} needs a body shape: tuck, pike or straight.`,
      })
    }
  }
}

export const elementInputSchema = z.object(elementFields).superRefine(checkElement)
export type ElementInput = z.infer<typeof elementInputSchema>

/** An element as the API answers it: the input, its identity and every derived field. */
export const elementSchema = z
  .object({
    ...elementFields,
    id: z.uuid(),
    clubId: z.uuid(),
    saltoCount: z.number().int().min(0),
    totalHalfTwists: z.number().int().min(0),
    rotationClass: z.enum(rotationClasses),
    twistBand: z.enum(twistBands),
    notation: z.string().nullable(),
    trampolineDifficulty: z.number().nullable(),
    difficultyValue: z.number().nullable(),
    counterpartKey: z.string().nullable(),
    counterpartId: z.uuid().nullable(),
  })
  .superRefine(checkElement)
export type CatalogueElement = z.infer<typeof elementSchema>
