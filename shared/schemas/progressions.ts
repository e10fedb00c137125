import { z } from 'zod'
import { modalities } from '../domain/element.ts'
import { text } from './text.ts'

export const maxProgressionSteps = 20

export const progressionStepSchema = z.object({
  name: text({ error: 'Enter the step name.' })
    .min(1, 'Enter the step name.')
    .max(80, 'Keep the step name to 80 characters or fewer.'),
  modality: z.enum(modalities, { error: 'Choose where the step is done (the modality).' }),
  criterion: text({ error: 'Enter the criterion an athlete must meet to pass the step.' })
    .min(1, 'Enter the criterion an athlete must meet to pass the step.')
    .max(500, 'Keep the criterion to 500 characters or fewer.'),
  minDays: z
    .number({ error: 'Enter the minimum days at the step as a number.' })
    .int('Enter the minimum days at the step as a whole number.')
    .min(0, 'The minimum days at the step cannot be negative.')
    .max(365, 'The minimum days at the step can be at most 365.')
    .nullish(),
})
export type ProgressionStep = z.infer<typeof progressionStepSchema>

/** A whole progression: its order is the learning order and its last step is competition-ready. */
export const progressionStepsSchema = z
  .array(progressionStepSchema)
  .min(1, 'A progression needs at least one step: the competition-ready one.')
  .max(maxProgressionSteps, `A progression can have at most ${maxProgressionSteps} steps.`)
  .superRefine((steps, ctx) => {
    // Names are how coaches tell steps apart on the floor, so two alike would be ambiguous.
    const firstIndexByName = new Map<string, number>()
    steps.forEach((step, index) => {
      const key = step.name.toLowerCase()
      const first = firstIndexByName.get(key)
      if (first === undefined) {
        firstIndexByName.set(key, index)
        return
      }
      ctx.addIssue({
        code: 'custom',
        path: [index, 'name'],
        message: `Step ${index + 1} has the same name as step ${first + 1} ("${step.name}"); give each step its own name.`,
      })
    })
  })
