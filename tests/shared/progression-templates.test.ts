import { describe, expect, it } from 'vitest'
import type { Modality } from '../../shared/domain/element.ts'
import {
  progressionTemplates,
  templateFamilies,
  templateFamilyFor,
  templateFor,
} from '../../shared/domain/progression-templates.ts'
import { progressionStepsSchema } from '../../shared/schemas/progressions.ts'

// Common practice (no published source): the order equipment is met in while learning a skill.
const floorLearningOrder: Record<Modality, number> = {
  'floor-drill': 0,
  trampoline: 1,
  'tumble-track': 1,
  'spotting-rig': 1,
  pit: 2,
  'soft-mat': 3,
  'hand-spot': 4,
  'floor-solo': 5,
  routine: 6,
}
const floorFamilies = templateFamilies.filter(
  (family) => !family.startsWith('trampoline-') && family !== 'triple-trampoline',
)

describe('progression templates', () => {
  it.each(templateFamilies)('%s is a valid progression ending competition-ready', (family) => {
    const template = progressionTemplates[family]
    expect(template.family).toBe(family)
    expect(progressionStepsSchema.safeParse(template.steps).success).toBe(true)
    const last = template.steps.at(-1)
    expect(last?.modality).toBe('routine')
    expect(last?.name).toBe('Competition-ready in a routine')
    expect(template.steps.filter((step) => step.modality === 'routine')).toHaveLength(1)
  })

  it.each(floorFamilies)('%s moves from drills to soft equipment to the floor', (family) => {
    // common practice (no published source)
    const ranks = progressionTemplates[family].steps.map(
      (step) => floorLearningOrder[step.modality],
    )
    expect(ranks[0]).toBe(0)
    expect(ranks).toEqual([...ranks].sort((a, b) => a - b))
    expect(ranks).toContain(floorLearningOrder['floor-solo'])
  })

  it.each(
    templateFamilies.filter(
      (family) => !['handspring-walkover', 'single-salto', 'trampoline-single'].includes(family),
    ),
  )('%s has a step in the twisting belt or spotting rig', (family) => {
    // common practice (no published source): twists and multiple saltos are learnt in a rig first
    const modalities = progressionTemplates[family].steps.map((step) => step.modality)
    expect(modalities).toContain('spotting-rig')
  })

  it.each([
    // common practice (no published source): the family follows rotation, twist and apparatus
    ['floor', 0, [], 'handspring-walkover'],
    ['tumbling', 4, [0], 'single-salto'],
    ['floor', 4, [2], 'twisting-single'],
    ['floor', 8, [0, 0], 'double-salto'],
    ['tumbling', 8, [2, 0], 'twisting-double'],
    ['floor', 12, [0, 0, 0], 'triple-salto'],
    ['trampoline', 4, [0], 'trampoline-single'],
    ['trampoline', 3, [0], 'trampoline-single'],
    ['trampoline', 4, [1], 'trampoline-twisting-single'],
    ['trampoline', 8, [0, 0], 'trampoline-double'],
    ['trampoline', 8, [0, 1], 'trampoline-twisting-double'],
    ['trampoline', 12, [0, 0, 1], 'triple-trampoline'],
    ['double-mini', 8, [0, 0], 'double-salto'],
  ] as const)(
    'gives a %s element of %i quarters and twists %j the %s family',
    (apparatus, q, twists, family) => {
      expect(templateFamilyFor({ apparatus, quarterRotations: q, twists })).toBe(family)
      expect(templateFor({ apparatus, quarterRotations: q, twists }).family).toBe(family)
    },
  )
})

describe('progression steps', () => {
  const step = { name: 'Solo on the floor', modality: 'floor-solo', criterion: 'Lands 8 of 10.' }

  it('refuses two steps with the same name, on the second one', () => {
    const result = progressionStepsSchema.safeParse([
      { ...step, name: 'Into the pit' },
      step,
      { ...step, name: 'solo on the floor' },
    ])
    expect(result.success).toBe(false)
    expect(result.error?.issues[0]?.path).toEqual([2, 'name'])
    expect(result.error?.issues[0]?.message).toBe(
      'Step 3 has the same name as step 2 ("solo on the floor"); give each step its own name.',
    )
  })

  it.each([
    [[], 'A progression needs at least one step: the competition-ready one.'],
    [
      Array.from({ length: 21 }, (_, i) => ({ ...step, name: `Step ${i + 1}` })),
      'A progression can have at most 20 steps.',
    ],
  ])('refuses a progression of %# steps out of range', (steps, message) => {
    expect(progressionStepsSchema.safeParse(steps).error?.issues[0]?.message).toBe(message)
  })

  it.each([
    ['criterion', { criterion: ' ' }, 'Enter the criterion an athlete must meet to pass the step.'],
    ['modality', { modality: 'bars' }, 'Choose where the step is done (the modality).'],
    ['minDays', { minDays: 2.5 }, 'Enter the minimum days at the step as a whole number.'],
    ['minDays', { minDays: -1 }, 'The minimum days at the step cannot be negative.'],
  ])('refuses a wrong %s, naming it', (field, change, message) => {
    const issue = progressionStepsSchema.safeParse([{ ...step, ...change }]).error?.issues[0]
    expect(issue?.path).toEqual([0, field])
    expect(issue?.message).toBe(message)
  })
})
